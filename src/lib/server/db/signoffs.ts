import { and, asc, eq, inArray } from 'drizzle-orm';
import { isoDateTime } from '../../format';
import { RefusedError } from '../errors';
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

/** A link's decision on one revision, as the review page and the refusal of a second one show it. */
export interface LinkDecision {
	decision: Decision;
	name: string;
	comment: string;
	at: string;
	revision: number;
}

/** What a review link already decided on this revision, if anything. */
export function linkDecision(reviewLinkId: number, revision: RevisionRow): LinkDecision | null {
	const row = db()
		.select()
		.from(signoffs)
		.where(and(eq(signoffs.reviewLinkId, reviewLinkId), eq(signoffs.revisionId, revision.id)))
		.orderBy(asc(signoffs.id))
		.get();
	if (!row) return null;
	return {
		decision: row.decision,
		name: row.name,
		comment: row.comment,
		at: row.createdAt.toISOString(),
		revision: revision.number
	};
}

/**
 * Stores a sign-off (with its audit row) in one transaction; mail goes out only after this commits.
 * A review link decides once per revision: whoever holds it cannot overwrite or contradict the
 * decision the crew was mailed. A new revision behind a "latest" link, or a new link, decides anew.
 */
export function createSignoff(revision: RevisionRow, input: NewSignoff) {
	return db().transaction((tx) => {
		const earlier = input.reviewLinkId ? linkDecision(input.reviewLinkId, revision) : null;
		if (earlier) {
			const what = earlier.decision === 'approved' ? 'an approval' : 'a request for changes';
			throw new RefusedError(
				`This link already recorded ${what} of revision ${earlier.revision} by ${earlier.name} ` +
					`(${isoDateTime(earlier.at)}). A new decision needs a new revision or a new review link.`,
				{ code: 'already-decided', extra: { signoff: earlier } }
			);
		}
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
