import { redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { action, parseWith } from '$lib/server/forms';
import { num, text } from '$lib/server/form-fields';
import { InvalidError } from '$lib/server/errors';
import { deleteProject, getProject, projectShape, updateProject } from '$lib/server/db/projects';
import { projectPatch } from '$lib/schemas/project';
import type { Actions, PageServerLoad } from './$types';

// The owner's page for the project itself; the crew page does roles and owner hand-over.
export const load: PageServerLoad = async (event) => {
	const { projectId, role } = requireRole(event, event.params.id, 'owner');
	return { settings: projectShape(getProject(projectId)!, role) };
};

const date = (form: FormData, key: string) => {
	const v = text(form, key)?.trim();
	return v === undefined ? undefined : v === '' ? null : v;
};

export const actions: Actions = {
	update: action('update', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const patch = parseWith(projectPatch, {
			name: text(form, 'name'),
			venue: text(form, 'venue'),
			notes: text(form, 'notes'),
			startsOn: date(form, 'startsOn'),
			endsOn: date(form, 'endsOn'),
			artnetOffset: num(form, 'artnetOffset'),
			version: num(form, 'version')
		});
		updateProject(projectId, user.id, patch);
		return { done: 'Project settings saved.' };
	}),
	delete: action('delete', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'owner');
		const project = getProject(projectId)!;
		// typing the name is the confirmation: a stray click never deletes a show's paperwork
		if ((text(form, 'confirm') ?? '').trim() !== project.name.trim())
			throw new InvalidError('Type the project name exactly to delete it.', [
				{ path: ['confirm'], message: `Type "${project.name}" to confirm.` }
			]);
		deleteProject(projectId, user.id);
		redirect(303, '/');
	})
};
