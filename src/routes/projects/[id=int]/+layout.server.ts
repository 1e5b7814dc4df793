import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { getProject, projectShape } from '$lib/server/db/projects';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async (event) => {
	// An electrician scanning a label while signed out signs in and lands back on that fixture.
	// Only the way in: requireRole below (and in every page load) still decides.
	if (!event.locals.user)
		redirect(303, `/signin?callbackUrl=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	const { projectId, role } = requireRole(event, event.params.id, 'viewer');
	// what GET /api/projects/:pid answers, without a second trip through the hooks
	return { project: projectShape(getProject(projectId)!, role), role };
};
