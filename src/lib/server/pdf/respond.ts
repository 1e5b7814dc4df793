import type { RequestEvent } from '@sveltejs/kit';
import { requireRole } from '../authz';
import { publicBaseUrl } from '../config';
import { loadPower } from '../db/power';
import { getProject } from '../db/projects';
import { downloadName } from '../download-name';
import { InvalidError, NotFoundError } from '../errors';
import { runJob } from '../workers/pool';
import type { Task } from '../workers/tasks';
import { PAPERS, type Paper, type TitleInfo } from './common';
import { loadSheetData, type SheetData } from './data';

// The one module behind every printed sheet: GET …/sheets/{patch,labels,radio,power}.pdf and the
// review link's sheets. Any member may print any sheet: every role may read the whole patch
// (DESIGN "Roles"), and a sheet shows nothing more. Rendering runs in a worker thread.

export type SheetKind = 'patch' | 'labels' | 'radio' | 'power';
/** The sheets a revision holds (packs and circuits are not part of a revision snapshot). */
export type PatchSheetKind = Exclude<SheetKind, 'power'>;

const SHEET_TITLE: Record<SheetKind, string> = {
	patch: 'Patch sheet',
	labels: 'Labels',
	radio: 'Radio sheet',
	power: 'Power sheet'
};

function positiveInt(value: string, what: string): number {
	if (!/^\d{1,9}$/.test(value) || Number(value) < 1)
		throw new InvalidError(`${what} must be a whole number of 1 or more, not "${value}".`);
	return Number(value);
}

export interface SheetQuery {
	revision?: number;
	paper: Paper;
	fixtures?: number[];
	/** patch sheet: every DMX parameter at its universe.address (`?channels=absolute`) */
	absolute?: boolean;
}

export function parseSheetQuery(params: URLSearchParams, kind: SheetKind): SheetQuery {
	const revision = params.get('revision');
	const paper = (params.get('paper') ?? 'a4').toLowerCase();
	if (!PAPERS.includes(paper as Paper)) throw new InvalidError(`paper must be a4 or letter, not "${paper}".`);
	if (revision !== null && kind === 'power')
		throw new InvalidError('The power sheet prints the current plan: packs and circuits are not part of a revision.');
	const fixtures = params.get('fixtures');
	if (fixtures !== null && kind !== 'labels')
		throw new InvalidError('fixtures= chooses labels; the other sheets print the whole patch.');
	const channels = params.get('channels');
	if (channels !== null && (kind !== 'patch' || !['offsets', 'absolute'].includes(channels)))
		throw new InvalidError('channels= is offsets or absolute, and only for the patch sheet.');
	return {
		paper: paper as Paper,
		...(channels === 'absolute' ? { absolute: true } : {}),
		...(revision !== null ? { revision: positiveInt(revision, 'revision') } : {}),
		...(fixtures !== null
			? {
					fixtures: [
						...new Set(
							fixtures
								.split(',')
								.filter((s) => s.trim() !== '')
								.map((s) => positiveInt(s.trim(), 'Each fixture number'))
						)
					]
				}
			: {})
	};
}

export function sheetTitle(kind: SheetKind, data: SheetData): TitleInfo {
	return {
		sheet: SHEET_TITLE[kind],
		project: data.patch.project.name,
		revision: data.revision ? `Revision ${data.revision.number}` : 'Draft — current patch, not a revision',
		printed: data.printedAt,
		signoff: data.signoff.text
	};
}

export function sheetFileName(kind: SheetKind, projectName: string, revision: number | null): string {
	return downloadName(projectName, `${kind}-${revision === null ? 'draft' : `r${revision}`}`, 'pdf');
}

/** A member prints the live patch or any revision of their project. */
export async function sheetResponse(event: RequestEvent, kind: SheetKind): Promise<Response> {
	const { projectId, user } = requireRole(event, event.params.pid, 'viewer');
	return renderSheet(projectId, kind, parseSheetQuery(event.url.searchParams, kind), user.id);
}

/** Renders one sheet for `owner` (workers/pool.ts) after the caller's access to `query.revision` (or the live patch) is settled. */
export async function renderSheet(
	projectId: number,
	kind: SheetKind,
	query: SheetQuery,
	owner: string
): Promise<Response> {
	const { task, name } = kind === 'power' ? powerTask(projectId, query) : patchTask(projectId, kind, query);
	const pdf = await runJob<Uint8Array>(task, `Printing the ${SHEET_TITLE[kind].toLowerCase()}`, owner);
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="${name}"`,
			'content-length': String(pdf.length),
			'cache-control': 'private, no-store'
		}
	});
}

function patchTask(projectId: number, kind: PatchSheetKind, query: SheetQuery): { task: Task; name: string } {
	const data = loadSheetData(projectId, query.revision);
	if (query.fixtures) {
		const known = new Set(data.patch.fixtures.map((f) => f.number));
		const unknown = query.fixtures.filter((n) => !known.has(n));
		if (unknown.length)
			throw new InvalidError(
				`No fixture numbered ${unknown.join(', ')} in this ${data.revision ? 'revision' : 'patch'}.`
			);
		if (query.fixtures.length === 0) throw new InvalidError('Choose at least one fixture number.');
	}
	return {
		task: {
			kind: 'pdf',
			sheet: kind,
			patch: data.patch,
			title: sheetTitle(kind, data),
			paper: query.paper,
			...(kind === 'patch' ? { patchOptions: { absolute: query.absolute ?? false } } : {}),
			...(kind === 'labels' ? { labels: { baseUrl: publicBaseUrl(), projectId, numbers: query.fixtures } } : {})
		},
		name: sheetFileName(kind, data.patch.project.name, data.revision?.number ?? null)
	};
}

function powerTask(projectId: number, query: SheetQuery): { task: Task; name: string } {
	const project = getProject(projectId);
	if (!project) throw new NotFoundError('No such project.');
	return {
		task: {
			kind: 'power-pdf',
			power: loadPower(projectId),
			paper: query.paper,
			title: {
				sheet: SHEET_TITLE.power,
				project: project.name,
				revision: 'Draft — current plan, not a revision',
				printed: new Date().toISOString(),
				signoff: 'none (a power plan is not part of a revision)'
			}
		},
		name: sheetFileName('power', project.name, null)
	};
}
