import type { RequestEvent } from '@sveltejs/kit';
import type { Conflict } from '../patch/index';
import { GoneError, NotFoundError, RateLimitedError } from './errors';
import { publicBaseUrl } from './config';
import { getProject } from './db/projects';
import { lookupToken } from './db/review-links';
import {
	computeSnapshot,
	diffSnapshots,
	lastApproved,
	latestRevision,
	revisionShape,
	snapshotOf,
	type RevisionRow
} from './db/revisions';
import { createSignoff, signoffRecipients, type NewSignoff } from './db/signoffs';
import { sendMail } from './mail/outbox';
import { signoffMail } from './mail/templates';
import { reviewLookupByIp } from './ratelimit';

// What a review-link holder may see: one revision of one project, nothing else.

export function conflictSummary(conflicts: Conflict[]) {
	return {
		errors: conflicts.filter((c) => c.severity === 'error').length,
		warnings: conflicts.filter((c) => c.severity === 'warning').length,
		info: conflicts.filter((c) => c.severity === 'info').length
	};
}

/** Counts the lookup against the caller's address first, so forged tokens cost a try too. */
export function resolveToken(event: Pick<RequestEvent, 'params' | 'getClientAddress'>) {
	if (!reviewLookupByIp.hit(event.getClientAddress())) {
		throw new RateLimitedError('Too many review-link requests from your address; wait a minute and try again.');
	}
	const found = lookupToken(event.params.token ?? '');
	switch (found.status) {
		case 'not-found':
			throw new NotFoundError('This review link does not exist. Check that the whole link was copied.');
		case 'revoked':
			throw new GoneError('This review link was withdrawn. Ask the programmer for a new one.');
		case 'expired':
			throw new GoneError('This review link has expired. Ask the programmer for a new one.');
		case 'no-revision':
			throw new NotFoundError('Nothing to review yet: the project has no revision.');
		default:
			return found;
	}
}

/** The review page's data: the revision computed from its own snapshot, and what changed since the last approval before it. */
export function reviewPayload(link: { revisionId: number | null; expiresAt: Date | null }, revision: RevisionRow) {
	const snapshot = snapshotOf(revision);
	const { universes, types, receivers, fixtures, conflicts } = computeSnapshot(snapshot);
	const approved = lastApproved(revision.projectId, revision.number);
	const project = getProject(revision.projectId);
	return {
		project: {
			name: project?.name ?? snapshot.project.name,
			venue: project?.venue ?? snapshot.project.venue,
			startsOn: project?.startsOn ?? snapshot.project.startsOn,
			endsOn: project?.endsOn ?? snapshot.project.endsOn
		},
		link: {
			revision: link.revisionId === null ? ('latest' as const) : revision.number,
			expiresAt: link.expiresAt?.toISOString() ?? null
		},
		revision: revisionShape(revision),
		patch: { universes, types, receivers, fixtures, conflicts, summary: conflictSummary(conflicts) },
		diff: approved ? { since: approved.number, ...diffSnapshots(snapshotOf(approved), snapshot) } : null
	};
}

export function revisionsPageUrl(projectId: number): string {
	return `${publicBaseUrl()}/projects/${projectId}/revisions`;
}

/**
 * Stores the sign-off, then mails the owners and programmers. The row is
 * committed before any mail is tried, and each mail is in the outbox before
 * SMTP, so a mail failure never loses a sign-off; the outbox timer retries.
 */
export async function signOff(revision: RevisionRow, input: NewSignoff) {
	const row = createSignoff(revision, input);
	const project = getProject(revision.projectId);
	const mails = signoffRecipients(revision.projectId).map((to) =>
		sendMail(
			signoffMail(to, {
				projectName: project?.name ?? '',
				revision: revision.number,
				note: revision.note,
				decision: row.decision,
				name: row.name,
				comment: row.comment,
				url: revisionsPageUrl(revision.projectId)
			})
		).catch((err: unknown) => console.error('sign-off mail not queued', err))
	);
	// A slow mail server must not hold the answer: the outbox has the mail either way.
	await Promise.race([Promise.allSettled(mails), new Promise((r) => setTimeout(r, 5000).unref())]);
	return {
		decision: row.decision,
		name: row.name,
		comment: row.comment,
		at: row.createdAt.toISOString(),
		stale: revision.number < (latestRevision(revision.projectId)?.number ?? revision.number),
		revision: revision.number
	};
}
