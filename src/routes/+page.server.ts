import { fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import type { Project } from '$lib/server/db/projects';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, fetch }) => {
	if (!locals.user) redirect(303, '/signin');
	const res = await fetch('/api/projects');
	const body = (await res.json()) as { projects: Project[] };
	return { projects: body.projects };
};

export const actions: Actions = {
	create: async (event) => {
		requireUser(event);
		const form = await event.request.formData();
		const values = {
			name: String(form.get('name') ?? ''),
			venue: String(form.get('venue') ?? ''),
			startsOn: String(form.get('startsOn') ?? '') || null,
			endsOn: String(form.get('endsOn') ?? '') || null
		};
		// the form goes through the same route (and zod schema) as the JSON API
		const res = await event.fetch('/api/projects', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(values)
		});
		const body = await res.json();
		if (res.status !== 201) {
			const errors: Record<string, string> = {};
			for (const issue of body.error?.issues ?? []) errors[String(issue.path[0])] ??= issue.message;
			return fail(400, { values, errors, message: body.error?.message as string });
		}
		redirect(303, `/projects/${body.id}`);
	}
};
