import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { memberSignOff, throttleSignoff } from '$lib/server/review';
import { revisionOr404 } from '$lib/server/revision-access';
import { memberSignoff } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

// Any member may sign off; the name is their account's.
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'viewer');
	const row = revisionOr404(projectId, event.params.n);
	throttleSignoff(event.getClientAddress());
	const input = await readJson(event, memberSignoff);
	return json(await memberSignOff(row, user, input), { status: 201 });
});
