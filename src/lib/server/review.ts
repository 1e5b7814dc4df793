import type { RequestEvent } from '@sveltejs/kit';
import type { Conflict } from '../patch/index';
import { GoneError, NotFoundError, RateLimitedError } from './errors';
import { publicBaseUrl } from './config';
import { getProject } from './db/projects';
import { createReviewLink, latestLinkRecipients, lookupToken, revokeReviewLink } from './db/review-links';
import {
	computeSnapshot,
	diffSnapshots,
	lastApproved,
	latestRevision,
	revisionShape,
	snapshotOf,
	type RevisionRow
} from './db/revisions';
import { createSignoff, linkDecision, signoffRecipients, type NewSignoff } from './db/signoffs';
import { queueMail } from './mail/outbox';
import { newRevisionMail, signoffMail } from './mail/templates';
import { memberMailByAddress, memberMailBySender, reviewLookupByIp, signoffByIp, throttle } from './ratelimit';
import { revisionOr404 } from './revision-access';
import type { z } from 'zod';
import type { reviewLinkCreate } from '../schemas/revision';
import type { SignoffDecision } from '../vocab';
import { reviewLinkMail } from './mail/templates';

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

/**
 * The review page's data: the revision computed from its own snapshot, what changed since the last
 * approval before it, and the decision this link already recorded on it (then the page offers no form).
 */
export function reviewPayload(
	link: { id: number; revisionId: number | null; expiresAt: Date | null },
	revision: RevisionRow
) {
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
			expiresAt: link.expiresAt?.toISOString() ?? null,
			signoff: linkDecision(link.id, revision)
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
	const changes = changesSinceApproval(revision);
	for (const to of signoffRecipients(revision.projectId)) {
		queueMail(
			signoffMail(to, {
				projectName: project?.name ?? '',
				revision: revision.number,
				note: revision.note,
				decision: row.decision,
				name: row.name,
				comment: row.comment,
				url: revisionsPageUrl(revision.projectId),
				changes
			}),
			{ projectId: revision.projectId, kind: 'sign-off' }
		);
	}
	return {
		decision: row.decision,
		name: row.name,
		comment: row.comment,
		at: row.createdAt.toISOString(),
		stale: revision.number < (latestRevision(revision.projectId)?.number ?? revision.number),
		revision: revision.number
	};
}

export interface IssuedLink {
	id: number;
	url: string;
	expiresAt: string | null;
	revision: number | 'latest';
	mailed?: boolean;
}

/** Makes a review link (and mails it when asked). The token is in the answer's url once; only its hash is kept. */
export async function issueReviewLink(
	projectId: number,
	user: { id: string; name: string | null; email: string },
	input: z.output<typeof reviewLinkCreate>
): Promise<IssuedLink> {
	const revision = input.revision === 'latest' ? null : revisionOr404(projectId, String(input.revision));
	// mail to an outside address is throttled per sender and per address, before anything is written
	if (input.email) {
		throttle('review-link mails', [
			[memberMailBySender, user.id],
			[memberMailByAddress, input.email.trim().toLowerCase()]
		]);
	}
	const { row, token } = createReviewLink(projectId, user.id, {
		revisionId: revision?.id ?? null,
		expiresInDays: input.expiresInDays,
		label: input.email ?? ''
	});
	const url = `${publicBaseUrl()}/review/${token}`;
	let mailed: boolean | undefined;
	if (input.email) {
		queueMail(
			reviewLinkMail(input.email, {
				projectName: getProject(projectId)?.name ?? '',
				revision: revision?.number ?? 'latest',
				sentBy: user.email,
				expiresAt: row.expiresAt,
				url
			}),
			{ projectId, kind: 'review-link' }
		);
		mailed = true;
	}
	return {
		id: row.id,
		url,
		expiresAt: row.expiresAt?.toISOString() ?? null,
		revision: revision?.number ?? 'latest',
		...(mailed === undefined ? {} : { mailed })
	};
}

/** Revokes the link; its token answers 410 from then on. */
export function revokeLink(projectId: number, id: number | null, userId: string): void {
	if (id === null || !revokeReviewLink(projectId, id, userId))
		throw new NotFoundError('No such review link in this project.');
}

/** Sign-offs per client address: counted before the body is read, as for review-link lookups. */
export function throttleSignoff(clientAddress: string): void {
	if (!signoffByIp.hit(clientAddress))
		throw new RateLimitedError('Too many sign-offs from your address; wait a minute.');
}

/** A member's sign-off of a revision, under their account's name. */
export function memberSignOff(
	revision: RevisionRow,
	user: { id: string; name: string | null; email: string },
	input: { decision: SignoffDecision; comment: string }
) {
	return signOff(revision, { ...input, name: user.name || user.email, userId: user.id });
}

/** The plan changes since the last approval before `revision`, as the review page words them. */
export function changesSinceApproval(revision: RevisionRow): { since: number; lines: string[] } | null {
	const approved = lastApproved(revision.projectId, revision.number);
	if (!approved) return null;
	const { changes } = diffSnapshots(snapshotOf(approved), snapshotOf(revision));
	return { since: approved.number, lines: changes.plan.map((l) => l.text) };
}

/**
 * Tells the holders of "always the latest" links that a new revision is behind their link. Mails go
 * through the outbox (stored first, retried), so a slow or failed send never undoes the revision.
 */
export async function notifyLatestLinks(revision: RevisionRow): Promise<void> {
	const to = latestLinkRecipients(revision.projectId);
	if (to.length === 0) return;
	const project = getProject(revision.projectId);
	const changes = changesSinceApproval(revision);
	for (const address of to) {
		queueMail(
			newRevisionMail(address, {
				projectName: project?.name ?? '',
				revision: revision.number,
				note: revision.note,
				changes
			}),
			{ projectId: revision.projectId, kind: 'review-link' }
		);
	}
}
