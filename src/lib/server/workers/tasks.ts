import { ApiError } from '../api';
import { DomainError } from '../errors';
import { move } from 'piscina';
import { applyCsvPlan, importParsedCsv, parseCsvPatch, type CsvSummary } from '../import/csv';
import { keepPlan, planKey, takePlan } from '../import/csv-plan';
import { decodeSpreadsheet } from '../import/limits';
import type { LabelOptions } from '../pdf/label-sheet';
import type { PatchSheetOptions } from '../pdf/patch-sheet';
import type { Paper, TitleInfo } from '../pdf/common';
import type { PatchData } from '../db/patch';
import type { PowerView } from '../db/power';
import type { PatchSheetKind } from '../pdf/respond';

// What runs in the worker threads (pool.ts): the CPU-heavy, I/O-free steps of imports, backup checks and
// printed sheets. Plain data in, plain data out; only a CSV import opens the database (its own
// connection, in this thread).

export type Task =
	| { kind: 'csv'; bytes: Uint8Array }
	| { kind: 'csv-import'; bytes: Uint8Array; projectId: number; userId: string; apply: boolean }
	| { kind: 'gdtf'; bytes: Uint8Array }
	| { kind: 'json-backup'; bytes: Uint8Array }
	| {
			kind: 'pdf';
			sheet: PatchSheetKind;
			patch: PatchData;
			title: TitleInfo;
			paper: Paper;
			labels?: Omit<LabelOptions, 'paper'>;
			patchOptions?: PatchSheetOptions;
	  }
	| { kind: 'power-pdf'; power: PowerView; title: TitleInfo; paper: Paper };

/** A refusal crosses the thread boundary as data and is thrown again on the main thread. */
export interface Refusal {
	refused: { status: number; message: string; extra: Record<string, unknown> };
}

/**
 * An import's answer as the JSON the route sends, serialised here and moved (not copied) to the
 * request loop: a 20,000-row preview's summary is megabytes, and cloning it across threads and
 * serialising it again there held up every other request.
 */
function summaryJson(summary: CsvSummary) {
	const json = JSON.stringify(summary);
	// into a buffer of its own (so it can be moved); TextEncoder.encode took ten times as long here
	const bytes = new Uint8Array(Buffer.byteLength(json));
	new TextEncoder().encodeInto(json, bytes);
	return move(bytes);
}

async function run(task: Task): Promise<unknown> {
	switch (task.kind) {
		case 'csv': {
			const decoded = decodeSpreadsheet(task.bytes);
			if (!decoded) return { decoded: null };
			const isJson = /^\s*\{/.test(decoded.text.slice(0, 64));
			return { decoded: { encoding: decoded.encoding, isJson }, parsed: isJson ? null : parseCsvPatch(decoded.text) };
		}
		case 'csv-import': {
			// the whole import, writes too, on this thread's own connection to the database file (WAL): a
			// 20,000-row preview holds SQLite for a second or more, and that second must not be the
			// request loop's. A preview rolls back; an apply commits and the main thread's patch cache
			// sees the new data_version.
			// An apply of the file this thread just previewed, into a database nobody has written since,
			// writes the preview's checked plan (csv-plan.ts); otherwise, and for every preview, the whole pass.
			const key = planKey(task.projectId, task.userId, task.bytes);
			const kept = takePlan(key);
			if (task.apply && kept) {
				const summary = applyCsvPlan(task.projectId, task.userId, kept.plan, kept.state);
				if (summary) return summaryJson(summary);
			}
			const decoded = decodeSpreadsheet(task.bytes);
			if (!decoded) return { decoded: null };
			if (/^\s*\{/.test(decoded.text.slice(0, 64))) return { decoded: { encoding: decoded.encoding, isJson: true } };
			const parsed = parseCsvPatch(decoded.text);
			return summaryJson(
				importParsedCsv(
					task.projectId,
					task.userId,
					parsed,
					task.apply,
					task.apply ? undefined : (plan, state) => keepPlan(key, plan, state)
				)
			);
		}
		case 'gdtf':
			return (await import('../import/gdtf')).parseGdtf(task.bytes);
		case 'json-backup':
			return (await import('../import/json-check')).checkBackupBytes(task.bytes);
		case 'pdf': {
			const pdf =
				task.sheet === 'patch'
					? await (
							await import('../pdf/patch-sheet')
						).renderPatchSheet(task.patch, task.title, task.paper, task.patchOptions)
					: task.sheet === 'radio'
						? await (await import('../pdf/radio-sheet')).renderRadioSheet(task.patch, task.title, task.paper)
						: await (
								await import('../pdf/label-sheet')
							).renderLabelSheet(task.patch, task.title, {
								paper: task.paper,
								...task.labels!
							});
			return new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength);
		}
		case 'power-pdf': {
			const pdf = await (await import('../pdf/power-sheet')).renderPowerSheet(task.power, task.title, task.paper);
			return new Uint8Array(pdf.buffer, pdf.byteOffset, pdf.byteLength);
		}
	}
}

export default async function handle(task: Task): Promise<unknown> {
	try {
		return await run(task);
	} catch (err) {
		if (err instanceof ApiError) return { refused: { status: err.status, message: err.message, extra: err.extra } };
		if (err instanceof DomainError) {
			const issues = err.issues();
			return {
				refused: {
					status: err.status,
					message: err.message,
					extra: { code: err.code, ...(issues ? { issues } : {}), ...err.extra() }
				}
			};
		}
		throw err;
	}
}
