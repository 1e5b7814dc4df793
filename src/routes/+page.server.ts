import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { createProject, listProjectsForUser } from '$lib/server/db/projects';
import { action, parseWith } from '$lib/server/forms';
import { projectCreate } from '$lib/schemas/project';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	if (!event.locals.user) redirect(303, '/signin');
	return { projects: listProjectsForUser(requireUser(event).id) };
};

export const actions: Actions = {
	// the same zod schema and db function as POST /api/projects
	create: action('create', (event, form) => {
		const user = requireUser(event);
		const input = parseWith(projectCreate, {
			name: String(form.get('name') ?? ''),
			venue: String(form.get('venue') ?? ''),
			startsOn: String(form.get('startsOn') ?? '') || null,
			endsOn: String(form.get('endsOn') ?? '') || null
		});
		const project = createProject(user.id, input);
		redirect(303, `/projects/${project.id}`);
	})
};
