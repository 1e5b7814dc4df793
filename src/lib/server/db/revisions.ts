import { and, asc, desc, eq, inArray, lt, sql } from 'drizzle-orm';
import {
	describeChanges,
	diffPatches,
	type DescribedChanges,
	type PatchDiff,
	type PatchSnapshot
} from '../../patch/index';
import { recordAudit } from './audit';
import { db } from './index';
import {
	computeFor,
	listFixtures,
	listReceivers,
	listTypes,
	listUniverses,
	type FixtureShape,
	type PatchData,
	type ReceiverShape,
	type TypeShape,
	type UniverseShape
} from './patch';
import { getProject, projectShape, type Project } from './projects';
import { revisions, signoffs } from './schema';
import type { RevisionShape, SignoffShape } from '../../shapes';

// Revisions are written once and never updated or deleted through the app.

/** Exactly the inputs of computeFor; the printed sheets read this format too. */
export interface RevisionSnapshot {
	project: Project;
	universes: UniverseShape[];
	types: TypeShape[];
	receivers: ReceiverShape[];
	fixtures: FixtureShape[];
}

export type { RevisionShape, SignoffShape };

export type RevisionRow = typeof revisions.$inferSelect;

export function liveSnapshot(projectId: number): RevisionSnapshot {
	const project = getProject(projectId);
	if (!project) throw new Error(`project ${projectId} not found`);
	return {
		project: projectShape(project),
		universes: listUniverses(projectId),
		types: listTypes(projectId),
		receivers: listReceivers(projectId),
		fixtures: listFixtures(projectId)
	};
}

export function computeSnapshot(s: RevisionSnapshot): PatchData {
	return computeFor(s.project, s.types, s.universes, s.receivers, s.fixtures);
}

/** Field-level changes from `before` to `after`, by the engine's diff, and the same changes in the crew's words. */
export function diffSnapshots(
	before: RevisionSnapshot,
	after: RevisionSnapshot
): PatchDiff & { changes: DescribedChanges } {
	// The shapes are JSON all the way down; the engine's snapshot type just spells that out.
	const b = before as unknown as PatchSnapshot;
	const a = after as unknown as PatchSnapshot;
	const diff = diffPatches(b, a);
	return { ...diff, changes: describeChanges(diff, b, a) };
}

/** Snapshots the live patch as the next revision; number and snapshot are read inside one transaction. */
export function createRevision(
	projectId: number,
	author: { id: string; name: string | null; email: string },
	note: string
): RevisionRow {
	return db().transaction((tx) => {
		const next =
			tx
				.select({ n: sql<number>`coalesce(max(${revisions.number}), 0) + 1` })
				.from(revisions)
				.where(eq(revisions.projectId, projectId))
				.get()?.n ?? 1;
		const row = tx
			.insert(revisions)
			.values({
				projectId,
				number: next,
				note,
				authorId: author.id,
				authorName: author.name || author.email,
				snapshot: liveSnapshot(projectId)
			})
			.returning()
			.get();
		recordAudit({
			projectId,
			userId: author.id,
			action: 'revision.create',
			entity: 'revision',
			entityId: row.number,
			after: { number: row.number, note }
		});
		return row;
	});
}

export function getRevision(projectId: number, number: number): RevisionRow | undefined {
	return db()
		.select()
		.from(revisions)
		.where(and(eq(revisions.projectId, projectId), eq(revisions.number, number)))
		.get();
}

export function getRevisionById(id: number): RevisionRow | undefined {
	return db().select().from(revisions).where(eq(revisions.id, id)).get();
}

export function latestRevision(projectId: number): RevisionRow | undefined {
	return db()
		.select()
		.from(revisions)
		.where(eq(revisions.projectId, projectId))
		.orderBy(desc(revisions.number))
		.limit(1)
		.get();
}

/** The newest revision with an approval, optionally only among those numbered below `before`. */
export function lastApproved(projectId: number, before?: number): RevisionRow | undefined {
	const row = db()
		.select({ id: revisions.id })
		.from(revisions)
		.innerJoin(signoffs, eq(signoffs.revisionId, revisions.id))
		.where(
			and(
				eq(revisions.projectId, projectId),
				eq(signoffs.decision, 'approved'),
				before === undefined ? undefined : lt(revisions.number, before)
			)
		)
		.orderBy(desc(revisions.number))
		.limit(1)
		.get();
	return row ? getRevisionById(row.id) : undefined;
}

function signoffsFor(revisionIds: number[]) {
	if (revisionIds.length === 0) return new Map<number, (typeof signoffs.$inferSelect)[]>();
	const rows = db()
		.select()
		.from(signoffs)
		.where(inArray(signoffs.revisionId, revisionIds))
		.orderBy(asc(signoffs.createdAt), asc(signoffs.id))
		.all();
	const byRevision = new Map<number, (typeof signoffs.$inferSelect)[]>();
	for (const s of rows) byRevision.set(s.revisionId, [...(byRevision.get(s.revisionId) ?? []), s]);
	return byRevision;
}

/** Stale is computed at read time: a sign-off speaks for its revision only, so a later revision supersedes it. */
function shape(
	r: Omit<RevisionRow, 'snapshot'>,
	rows: (typeof signoffs.$inferSelect)[],
	latestNumber: number
): RevisionShape {
	return {
		number: r.number,
		note: r.note,
		author: r.authorName,
		createdAt: r.createdAt.toISOString(),
		signoffs: rows.map((s) => ({
			decision: s.decision,
			name: s.name,
			comment: s.comment,
			at: s.createdAt.toISOString(),
			stale: r.number < latestNumber
		}))
	};
}

/** Newest first, without snapshots. */
export function listRevisions(projectId: number): RevisionShape[] {
	const rows = db()
		.select({
			id: revisions.id,
			projectId: revisions.projectId,
			number: revisions.number,
			note: revisions.note,
			authorId: revisions.authorId,
			authorName: revisions.authorName,
			createdAt: revisions.createdAt
		})
		.from(revisions)
		.where(eq(revisions.projectId, projectId))
		.orderBy(desc(revisions.number))
		.all();
	const byRevision = signoffsFor(rows.map((r) => r.id));
	const latestNumber = rows[0]?.number ?? 0;
	return rows.map((r) => shape(r, byRevision.get(r.id) ?? [], latestNumber));
}

export function revisionShape(r: RevisionRow): RevisionShape {
	const latestNumber = latestRevision(r.projectId)?.number ?? r.number;
	return shape(r, signoffsFor([r.id]).get(r.id) ?? [], latestNumber);
}

export function snapshotOf(r: RevisionRow): RevisionSnapshot {
	return r.snapshot as RevisionSnapshot;
}
