import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import type { PatchData } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}/patch`);
	if (!res.ok) error(res.status, 'The patch could not be loaded');
	const p = (await res.json()) as PatchData;
	const counts = new Map<number, number>();
	for (const f of p.fixtures)
		if ((f.control.kind === 'dmx' || f.control.kind === 'dmx-map') && f.control.universeId != null)
			counts.set(f.control.universeId, (counts.get(f.control.universeId) ?? 0) + 1);
	return {
		role,
		universes: p.universes.map((u) => ({
			...u,
			fixtures: counts.get(u.id) ?? 0,
			errors: p.conflicts.filter((c) => c.universeId === u.id && c.severity === 'error').length
		}))
	};
};
