import { redirect } from '@sveltejs/kit';
import { parseId, requireRole, roleAtLeast } from '$lib/server/authz';
import { listReviewLinks } from '$lib/server/db/review-links';
import { createRevision, listRevisions } from '$lib/server/db/revisions';
import { DomainError } from '$lib/server/errors';
import { action, parseWith } from '$lib/server/forms';
import { issueReviewLink, memberSignOff, revokeLink, throttleSignoff } from '$lib/server/review';
import { revisionDiff, revisionOr404 } from '$lib/server/revision-access';
import { memberSignoff, reviewLinkCreate, revisionCreate } from '$lib/schemas/revision';
import type { Actions, PageServerLoad } from './$types';

// The revisions page reads and writes through the functions the JSON API's handlers call
// (…/revisions, …/review-links, …/revisions/:n/diff, …/signoffs), after the same requireRole.

export const load: PageServerLoad = async (event) => {
	const { projectId, role } = requireRole(event, event.params.id, 'viewer');
	const canEdit = roleAtLeast(role, 'programmer');
	const from = event.url.searchParams.get('from');
	const to = event.url.searchParams.get('to');
	const revisions = listRevisions(projectId);
	const links = canEdit ? listReviewLinks(projectId) : [];
	let diff = null;
	let diffError: string | null = null;
	if (from && to) {
		try {
			diff = revisionDiff(projectId, to, from);
		} catch (err) {
			// a stale comparison link shows its reason beside the list instead of an error page
			if (!(err instanceof DomainError)) throw err;
			diffError = err.message;
		}
	}
	const latest = revisions[0]?.number ?? null;
	// the newest approval before the latest revision: what the producer last agreed to
	const approved =
		revisions.find((r) => r.number !== latest && r.signoffs.some((s) => s.decision === 'approved'))?.number ?? null;
	return { revisions, links, canEdit, latest, approved, diff, diffError, from, to };
};

export const actions: Actions = {
	revise: action('revise', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const { note } = parseWith(revisionCreate, { note: String(form.get('note') ?? '') });
		createRevision(projectId, user, note);
		redirect(303, `/projects/${event.params.id}/revisions`);
	}),
	link: action('link', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const revision = String(form.get('revision') ?? 'latest');
		const expiresInDays = String(form.get('expiresInDays') ?? '30');
		const email = String(form.get('email') ?? '').trim();
		const input = parseWith(reviewLinkCreate, {
			revision: revision === 'latest' ? 'latest' : Number(revision),
			expiresInDays: expiresInDays === 'never' ? null : Number(expiresInDays),
			...(email ? { email } : {})
		});
		// the one time the token is shown: it is not stored, so it cannot be shown again
		return { created: await issueReviewLink(projectId, user, input), mailedTo: email };
	}),
	revoke: action('revoke', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		revokeLink(projectId, parseId(String(form.get('id') ?? '')), user.id);
		redirect(303, `/projects/${event.params.id}/revisions`);
	}),
	signoff: action('signoff', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'viewer');
		const row = revisionOr404(projectId, String(form.get('revision') ?? ''));
		throttleSignoff(event.getClientAddress());
		const input = parseWith(memberSignoff, {
			decision: String(form.get('decision') ?? ''),
			comment: String(form.get('comment') ?? '')
		});
		await memberSignOff(row, user, input);
		redirect(303, `/projects/${event.params.id}/revisions`);
	})
};
