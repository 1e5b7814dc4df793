import { requireRole } from '$lib/server/authz';
import type { Project } from '$lib/server/db/projects';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}`);
	const project = (await res.json()) as Project;
	return { project, role };
};
