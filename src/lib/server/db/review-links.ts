import { and, desc, eq, isNull } from 'drizzle-orm';
import { hashToken, newToken } from '../tokens';
import { recordAudit } from './audit';
import { db } from './index';
import { latestRevision, getRevisionById, type RevisionRow } from './revisions';
import { reviewLinks, revisions, users } from './schema';

export type ReviewLinkRow = typeof reviewLinks.$inferSelect;

import type { ReviewLinkShape } from '../../shapes';
export type { ReviewLinkShape };

const DAY = 24 * 60 * 60 * 1000;

/** The token is returned once, here; only its hash is stored. */
export function createReviewLink(
	projectId: number,
	userId: string,
	input: { revisionId: number | null; expiresInDays: number | null; label: string }
): { row: ReviewLinkRow; token: string } {
	const token = newToken();
	return db().transaction(() => {
		const row = db()
			.insert(reviewLinks)
			.values({
				projectId,
				revisionId: input.revisionId,
				tokenHash: hashToken(token),
				label: input.label,
				createdBy: userId,
				expiresAt: input.expiresInDays === null ? null : new Date(Date.now() + input.expiresInDays * DAY)
			})
			.returning()
			.get();
		recordAudit({
			projectId,
			userId,
			action: 'review-link.create',
			entity: 'review-link',
			entityId: row.id,
			after: { revisionId: row.revisionId, label: row.label, expiresAt: row.expiresAt }
		});
		return { row, token };
	});
}

export function linkStatus(row: ReviewLinkRow, now = Date.now()): ReviewLinkShape['status'] {
	if (row.revokedAt) return 'revoked';
	if (row.expiresAt && row.expiresAt.getTime() <= now) return 'expired';
	return 'active';
}

export function listReviewLinks(projectId: number): ReviewLinkShape[] {
	return db()
		.select({ link: reviewLinks, number: revisions.number, name: users.name, email: users.email })
		.from(reviewLinks)
		.leftJoin(revisions, eq(revisions.id, reviewLinks.revisionId))
		.leftJoin(users, eq(users.id, reviewLinks.createdBy))
		.where(eq(reviewLinks.projectId, projectId))
		.orderBy(desc(reviewLinks.createdAt), desc(reviewLinks.id))
		.all()
		.map(({ link, number, name, email }) => ({
			id: link.id,
			revision: link.revisionId === null ? 'latest' : (number ?? 0),
			label: link.label,
			createdBy: name || email || '',
			createdAt: link.createdAt.toISOString(),
			expiresAt: link.expiresAt?.toISOString() ?? null,
			revokedAt: link.revokedAt?.toISOString() ?? null,
			status: linkStatus(link)
		}));
}

/** Revoking keeps the row (sign-offs made through it still name it); false when there is no such link. */
export function revokeReviewLink(projectId: number, id: number, userId: string): boolean {
	return db().transaction(() => {
		const row = db()
			.select()
			.from(reviewLinks)
			.where(and(eq(reviewLinks.id, id), eq(reviewLinks.projectId, projectId)))
			.get();
		if (!row) return false;
		if (row.revokedAt) return true;
		db()
			.update(reviewLinks)
			.set({ revokedAt: new Date() })
			.where(and(eq(reviewLinks.id, id), isNull(reviewLinks.revokedAt)))
			.run();
		recordAudit({ projectId, userId, action: 'review-link.revoke', entity: 'review-link', entityId: id });
		return true;
	});
}

const TOKEN_SHAPE = /^[A-Za-z0-9_-]{43}$/;

export type TokenLookup =
	| { status: 'not-found' }
	| { status: 'expired' | 'revoked'; link: ReviewLinkRow }
	| { status: 'no-revision'; link: ReviewLinkRow }
	| { status: 'active'; link: ReviewLinkRow; revision: RevisionRow };

/** Resolves a token to its link and revision; a "latest" link resolves at request time. */
export function lookupToken(token: string): TokenLookup {
	if (!TOKEN_SHAPE.test(token)) return { status: 'not-found' };
	const link = db()
		.select()
		.from(reviewLinks)
		.where(eq(reviewLinks.tokenHash, hashToken(token)))
		.get();
	if (!link) return { status: 'not-found' };
	const status = linkStatus(link);
	if (status !== 'active') return { status, link };
	const revision = link.revisionId === null ? latestRevision(link.projectId) : getRevisionById(link.revisionId);
	if (!revision || revision.projectId !== link.projectId) return { status: 'no-revision', link };
	return { status: 'active', link, revision };
}

const ADDRESS = /^[^\s@]+@[^\s@]+\.[^\s@]+$/;

/**
 * Addresses behind active "always the latest" links. A link's label is the address it was e-mailed to
 * (review-links POST stores `email` there), so no other column is needed to reach its holder.
 */
export function latestLinkRecipients(projectId: number, now = Date.now()): string[] {
	const rows = db()
		.select()
		.from(reviewLinks)
		.where(and(eq(reviewLinks.projectId, projectId), isNull(reviewLinks.revisionId), isNull(reviewLinks.revokedAt)))
		.all();
	const to = rows.filter((r) => linkStatus(r, now) === 'active' && ADDRESS.test(r.label)).map((r) => r.label);
	return [...new Set(to)];
}
