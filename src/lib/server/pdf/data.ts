import { and, desc, eq, gt } from 'drizzle-orm';
import { NotFoundError } from '../errors';
import { db } from '../db/index';
import {
	computeFor,
	loadPatch,
	type FixtureShape,
	type PatchData,
	type ReceiverShape,
	type TypeShape,
	type UniverseShape
} from '../db/patch';
import { getProject, projectShape, type Project } from '../db/projects';
import { revisions, signoffs } from '../db/schema';

// What a sheet prints: the current patch ("draft") or one revision's snapshot,
// computed by the same engine, plus the sign-off line for the title block.

/** The snapshot format agreed with the revisions work: the arguments of computeFor. */
export interface RevisionSnapshot {
	project: Project;
	universes: UniverseShape[];
	types: TypeShape[];
	receivers: ReceiverShape[];
	fixtures: FixtureShape[];
}

export interface SignoffLine {
	state: 'approved' | 'changes-requested' | 'stale' | 'none';
	text: string;
}

export interface SheetData {
	patch: PatchData;
	/** null: the current patch, not a revision */
	revision: { number: number; note: string; author: string; createdAt: string } | null;
	signoff: SignoffLine;
	printedAt: string;
}

function day(d: Date): string {
	return d.toISOString().slice(0, 10);
}

interface SignoffRow {
	decision: 'approved' | 'changes-requested';
	name: string;
	createdAt: Date;
}

/**
 * The latest decision on a revision decides the line; an approval is stale once
 * a later revision exists (DESIGN "Revision").
 */
export function signoffLine(
	latest: SignoffRow | undefined,
	laterRevision: number | null,
	revisionNumber: number | null
): SignoffLine {
	const of = revisionNumber === null ? '' : `r${revisionNumber} `;
	if (!latest)
		return { state: 'none', text: revisionNumber === null ? 'none (no revision yet)' : `${of}not signed off` };
	if (latest.decision === 'changes-requested') {
		return { state: 'changes-requested', text: `${of}changes requested by ${latest.name} on ${day(latest.createdAt)}` };
	}
	const approved = `${of}approved by ${latest.name} on ${day(latest.createdAt)}`;
	if (laterRevision !== null) return { state: 'stale', text: `stale: ${approved}; r${laterRevision} is newer` };
	return { state: 'approved', text: approved };
}

function parseSnapshot(raw: unknown, current: Project): RevisionSnapshot {
	const s = (typeof raw === 'string' ? JSON.parse(raw) : raw) as Partial<RevisionSnapshot> | null;
	if (
		!s ||
		!Array.isArray(s.fixtures) ||
		!Array.isArray(s.universes) ||
		!Array.isArray(s.types) ||
		!Array.isArray(s.receivers)
	) {
		throw new Error('revision snapshot is not in the agreed { project, universes, types, receivers, fixtures } format');
	}
	// the snapshot's project wins (its name and Art-Net convention as they were)
	return { ...s, project: { ...current, ...(s.project ?? {}) } } as RevisionSnapshot;
}

export function loadSheetData(projectId: number, revisionNumber?: number, now = new Date()): SheetData {
	const row = getProject(projectId);
	if (!row) throw new NotFoundError('No such project.');
	const current = projectShape(row);
	const latestRevision = db()
		.select({ id: revisions.id, number: revisions.number })
		.from(revisions)
		.where(eq(revisions.projectId, projectId))
		.orderBy(desc(revisions.number))
		.get();

	const latestSignoff = (revisionId: number) =>
		db()
			.select({ decision: signoffs.decision, name: signoffs.name, createdAt: signoffs.createdAt })
			.from(signoffs)
			.where(eq(signoffs.revisionId, revisionId))
			.orderBy(desc(signoffs.createdAt), desc(signoffs.id))
			.get();

	if (revisionNumber === undefined) {
		const patch = loadPatch(projectId);
		const signoff = latestRevision
			? signoffLine(latestSignoff(latestRevision.id), null, latestRevision.number)
			: signoffLine(undefined, null, null);
		return { patch, revision: null, signoff, printedAt: now.toISOString() };
	}

	const rev = db()
		.select()
		.from(revisions)
		.where(and(eq(revisions.projectId, projectId), eq(revisions.number, revisionNumber)))
		.get();
	if (!rev) throw new NotFoundError(`No revision ${revisionNumber} in this project.`);
	const snap = parseSnapshot(rev.snapshot, current);
	const patch = computeFor(snap.project, snap.types, snap.universes, snap.receivers, snap.fixtures);
	const later = db()
		.select({ number: revisions.number })
		.from(revisions)
		.where(and(eq(revisions.projectId, projectId), gt(revisions.number, rev.number)))
		.orderBy(desc(revisions.number))
		.get();
	return {
		patch,
		revision: { number: rev.number, note: rev.note, author: rev.authorName, createdAt: rev.createdAt.toISOString() },
		signoff: signoffLine(latestSignoff(rev.id), later?.number ?? null, rev.number),
		printedAt: now.toISOString()
	};
}
