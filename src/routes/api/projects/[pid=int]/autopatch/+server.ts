import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { autopatch } from '$lib/server/db/fixtures';
import { autopatchInput } from '$lib/schemas/fixture';
import type { RequestHandler } from './$types';

// Previews by default; writes only with `apply: true` (DESIGN "Auto-address").
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, autopatchInput);
	return json(autopatch(projectId, user.id, input));
});
