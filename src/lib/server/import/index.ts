import { DuplicateError, UnsupportedTypeError } from '../errors';
import { createType } from '../db/fixture-types';
import { listTypes, type TypeShape } from '../db/patch';
import type { GdtfResult } from './gdtf';
import { sniff } from './limits';
import { runJob } from '../workers/pool';
import { breakFootprints } from '../../patch/footprint';
import type { Upload } from './multipart';
import type { TypeCreate } from '../../schemas/type';

// The project import route's one entry: decide the kind from the bytes, then
// preview (default) or apply.

export interface GdtfSummary {
	kind: 'gdtf';
	applied: boolean;
	dataVersion: string | null;
	warnings: string[];
	/** the type as it will be (preview) or was (applied) created */
	type: TypeCreate | TypeShape;
	/** `slots` is break 1's footprint; `breaks` lists every break's when the mode has more than one. */
	modes: { name: string; slots: number; channels: number; breaks?: { dmxBreak: number; slots: number }[] }[];
	exists: boolean;
}

/** A CSV import's summary (CsvSummary) as the JSON text to send, made in the worker. */
export interface CsvAnswer {
	kind: 'csv';
	applied: boolean;
	json: Uint8Array<ArrayBuffer>;
}

/** `apply=true` as a query parameter or a form field writes; anything else previews. */
export function wantsApply(url: URL, fields: Map<string, string>): boolean {
	const v = url.searchParams.get('apply') ?? fields.get('apply');
	return v === 'true' || v === '1';
}

/** Parsing runs in a worker thread (workers/pool.ts); a CSV import's writes run there too, on its own connection. */
export async function importUpload(
	projectId: number,
	userId: string,
	upload: Upload,
	apply: boolean
): Promise<GdtfSummary | CsvAnswer> {
	const kind = sniff(upload.bytes);
	const name = upload.name.toLowerCase();
	if (kind === 'zip') {
		if (name && !name.endsWith('.gdtf') && !name.endsWith('.zip'))
			throw new UnsupportedTypeError('A zip archive is read only as a GDTF fixture type (.gdtf).');
		const { type, dataVersion, warnings } = await runJob<GdtfResult>(
			{ kind: 'gdtf', bytes: upload.bytes },
			'Reading the GDTF file',
			userId
		);
		const exists = listTypes(projectId).some(
			(t) => t.maker.toLowerCase() === type.maker.toLowerCase() && t.model.toLowerCase() === type.model.toLowerCase()
		);
		if (apply && exists)
			throw new DuplicateError(
				`${type.maker} ${type.model} is already a fixture type in this project; rename or delete it first.`
			);
		const modes = type.modes.map((m) => {
			const breaks = breakFootprints({ id: 0, name: m.name, channels: m.channels });
			return {
				name: m.name,
				slots: breaks[0].slots,
				channels: m.channels.length,
				...(breaks.length > 1 ? { breaks } : {})
			};
		});
		const created = apply ? createType(projectId, userId, type) : type;
		return { kind: 'gdtf', applied: apply, dataVersion, warnings, type: created, modes, exists };
	}
	if (name.endsWith('.gdtf')) throw new UnsupportedTypeError('This .gdtf file is not a zip archive.');
	// the worker answers the summary as JSON bytes (workers/tasks.ts summaryJson), or what the file is not
	const job = await runJob<Uint8Array<ArrayBuffer> | { decoded: { isJson: boolean } | null }>(
		{ kind: 'csv-import', bytes: upload.bytes, projectId, userId, apply },
		apply ? 'Importing the CSV file' : 'Reading the CSV file',
		userId
	);
	if (!(job instanceof Uint8Array) && !job.decoded)
		throw new UnsupportedTypeError('The file is neither a CSV patch nor a GDTF fixture type.');
	if (kind === 'json' || !(job instanceof Uint8Array))
		throw new UnsupportedTypeError(
			'A project backup (.json) is imported as a new project: POST /api/projects/import-json.'
		);
	return { kind: 'csv', applied: apply, json: job };
}
