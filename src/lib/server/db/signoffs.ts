import { and, eq, inArray } from 'drizzle-orm';
import { recordAudit } from './audit';
import { db } from './index';
import { memberships, signoffs, users, type Decision } from './schema';
import type { RevisionRow } from './revisions';

export interface NewSignoff {
	decision: Decision;
	name: string;
	comment: string;
	userId?: string | null;
	reviewLinkId?: number | null;
}

/** Stores a sign-off (with its audit row) in one transaction; mail goes out only after this commits. */
export function createSignoff(revision: RevisionRow, input: NewSignoff) {
	return db().transaction((tx) => {
		const row = tx
			.insert(signoffs)
			.values({
				projectId: revision.projectId,
				revisionId: revision.id,
				decision: input.decision,
				name: input.name,
				comment: input.comment,
				userId: input.userId ?? null,
				reviewLinkId: input.reviewLinkId ?? null
			})
			.returning()
			.get();
		recordAudit({
			projectId: revision.projectId,
			userId: input.userId ?? null,
			action: 'signoff.create',
			entity: 'signoff',
			entityId: row.id,
			after: {
				revision: revision.number,
				decision: row.decision,
				name: row.name,
				comment: row.comment,
				reviewLinkId: row.reviewLinkId
			}
		});
		return row;
	});
}

/** Who hears about a sign-off: the people who make revisions. */
export function signoffRecipients(projectId: number): string[] {
	return db()
		.select({ email: users.email })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(and(eq(memberships.projectId, projectId), inArray(memberships.role, ['owner', 'programmer'])))
		.all()
		.map((r) => r.email)
		.filter((e): e is string => !!e);
}
