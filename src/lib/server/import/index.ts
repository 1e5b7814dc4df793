import { DuplicateError, UnsupportedTypeError } from '../errors';
import { createType } from '../db/types';
import { listTypes, type TypeShape } from '../db/patch';
import { importCsv, type CsvSummary } from './csv';
import { parseGdtf } from './gdtf';
import { decodeText, sniff } from './limits';
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
	modes: { name: string; slots: number; channels: number }[];
	exists: boolean;
}

/** `apply=true` as a query parameter or a form field writes; anything else previews. */
export function wantsApply(url: URL, fields: Map<string, string>): boolean {
	const v = url.searchParams.get('apply') ?? fields.get('apply');
	return v === 'true' || v === '1';
}

function slotsOf(channels: { offset: number | null; bits: number }[]): number {
	return channels.reduce((n, c) => (c.offset === null ? n : Math.max(n, c.offset + c.bits / 8 - 1)), 0);
}

export function importUpload(
	projectId: number,
	userId: string,
	upload: Upload,
	apply: boolean
): GdtfSummary | CsvSummary {
	const kind = sniff(upload.bytes);
	const name = upload.name.toLowerCase();
	if (kind === 'zip') {
		if (name && !name.endsWith('.gdtf') && !name.endsWith('.zip'))
			throw new UnsupportedTypeError('A zip archive is read only as a GDTF fixture type (.gdtf).');
		const { type, dataVersion, warnings } = parseGdtf(upload.bytes);
		const exists = listTypes(projectId).some(
			(t) => t.maker.toLowerCase() === type.maker.toLowerCase() && t.model.toLowerCase() === type.model.toLowerCase()
		);
		if (apply && exists)
			throw new DuplicateError(
				`${type.maker} ${type.model} is already a fixture type in this project; rename or delete it first.`
			);
		const modes = type.modes.map((m) => ({ name: m.name, slots: slotsOf(m.channels), channels: m.channels.length }));
		const created = apply ? createType(projectId, userId, type) : type;
		return { kind: 'gdtf', applied: apply, dataVersion, warnings, type: created, modes, exists };
	}
	if (name.endsWith('.gdtf')) throw new UnsupportedTypeError('This .gdtf file is not a zip archive.');
	if (kind === 'json')
		throw new UnsupportedTypeError(
			'A project backup (.json) is imported as a new project: POST /api/projects/import-json.'
		);
	if (kind === 'binary') throw new UnsupportedTypeError('The file is neither a CSV patch nor a GDTF fixture type.');
	return importCsv(projectId, userId, decodeText(upload.bytes), apply);
}
