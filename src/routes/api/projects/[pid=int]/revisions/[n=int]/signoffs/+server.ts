import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { signoffByIp } from '$lib/server/ratelimit';
import { signOff } from '$lib/server/review';
import { revisionOr404 } from '$lib/server/revision-access';
import { memberSignoff } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

// Any member may sign off; the name is their account's.
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'viewer');
	const row = revisionOr404(projectId, event.params.n);
	if (!signoffByIp.hit(event.getClientAddress()))
		throw new ApiError(429, 'Too many sign-offs from your address; wait a minute.');
	const { decision, comment } = await readJson(event, memberSignoff);
	const stored = await signOff(row, { decision, comment, name: user.name || user.email, userId: user.id });
	return json(stored, { status: 201 });
});
