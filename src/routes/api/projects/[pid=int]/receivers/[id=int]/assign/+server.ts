import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { idParam } from '$lib/server/params';
import { assignReceiver } from '$lib/server/db/receivers';
import { rcAssign } from '$lib/schemas/receiver';
import { publish } from '$lib/server/live';
import type { RequestHandler } from './$types';

// Gives the receiver's RC fixtures one channel per parameter. Like a command it
// applies by default; `apply: false` previews. An empty body means "all of them".
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const id = idParam(event.params.id, 'receiver');
	const hasBody =
		(event.request.headers.get('content-length') ?? '0') !== '0' || event.request.headers.has('content-type');
	const input = hasBody ? await readJson(event, rcAssign) : rcAssign.parse({});
	const result = assignReceiver(projectId, user.id, id, input);
	if (input.apply) publish(projectId, { ids: [...new Set(result.assigned.map((a) => a.fixtureId))], by: user.id });
	return json(result);
});
