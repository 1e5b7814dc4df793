import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { listReviewLinks } from '$lib/server/db/review-links';
import { issueReviewLink } from '$lib/server/review';
import { reviewLinkCreate } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'programmer');
	return json({ reviewLinks: listReviewLinks(projectId) });
});

/** The token is in the answer's url once; only its hash is kept. */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, reviewLinkCreate);
	return json(await issueReviewLink(projectId, user, input), { status: 201 });
});
