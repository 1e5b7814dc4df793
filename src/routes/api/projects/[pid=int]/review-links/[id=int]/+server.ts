import { api } from '$lib/server/api';
import { parseId, requireRole } from '$lib/server/authz';
import { revokeLink } from '$lib/server/review';
import type { RequestHandler } from './$types';

/** Revokes the link; its token answers 410 from then on. */
export const DELETE: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	revokeLink(projectId, parseId(event.params.id), user.id);
	return new Response(null, { status: 204 });
});
