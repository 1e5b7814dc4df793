import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import type { Project } from '$lib/server/db/projects';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	// An electrician scanning a label while signed out signs in and lands back on that fixture.
	// Only the way in: requireRole below (and in every page load) still decides.
	if (!event.locals.user)
		redirect(303, `/signin?callbackUrl=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}`);
	const project = (await res.json()) as Project;
	return { project, role };
};
