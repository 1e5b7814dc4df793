import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { loadPower, updatePowerSettings } from '$lib/server/db/power';
import { powerSettingsPatch } from '$lib/schemas/power';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const v = loadPower(projectId);
	return json({ settings: v.settings, ...v.power });
});

export const PATCH: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const patch = await readJson(event, powerSettingsPatch);
	return json(updatePowerSettings(projectId, user.id, patch));
});
