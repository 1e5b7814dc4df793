import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import type { TypeShape } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}/patch`);
	if (!res.ok) error(res.status, 'The patch could not be loaded');
	const p = (await res.json()) as { types: TypeShape[] };
	return { role, types: p.types };
};
