import { api, ApiError } from '$lib/server/api';
import { parseId, requireRole } from '$lib/server/authz';
import { revokeReviewLink } from '$lib/server/db/review-links';
import type { RequestHandler } from './$types';

/** Revokes the link; its token answers 410 from then on. */
export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = parseId(event.params.id);
	if (id === null || !revokeReviewLink(projectId, id, user.id))
		throw new ApiError(404, 'No such review link in this project.');
	return new Response(null, { status: 204 });
});
