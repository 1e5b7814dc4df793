import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { autopatch } from '$lib/server/db/fixtures';
import { autopatchInput } from '$lib/schemas/fixture';
import { publish } from '$lib/server/live';
import type { RequestHandler } from './$types';

// Previews by default; writes only with `apply: true` (DESIGN "Auto-address").
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, autopatchInput);
	const result = autopatch(projectId, user.id, input);
	if (result.applied) publish(projectId, { ids: result.placed.map((p) => p.fixtureId), by: user.id });
	return json(result);
});
