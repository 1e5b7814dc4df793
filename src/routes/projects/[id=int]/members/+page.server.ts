import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import type { Actions, PageServerLoad } from './$types';

interface Member {
	userId: string;
	email: string | null;
	name: string | null;
	role: string;
	since: string;
}

export const load: PageServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const res = await event.fetch(`/api/projects/${event.params.id}/members`);
	const { members } = (await res.json()) as { members: Member[] };
	return { members, canManage: role === 'owner' };
};

async function send(event: Parameters<Actions[string]>[0], path: string, method: string, body?: unknown) {
	const res = await event.fetch(`/api/projects/${event.params.id}/members${path}`, {
		method,
		headers: { 'content-type': 'application/json' },
		body: body === undefined ? undefined : JSON.stringify(body)
	});
	const payload = res.status === 204 ? null : await res.json();
	return { res, payload };
}

export const actions: Actions = {
	invite: async (event) => {
		requireRole(event, event.params.id, 'owner');
		const form = await event.request.formData();
		const values = { email: String(form.get('email') ?? ''), role: String(form.get('role') ?? 'viewer') };
		const { res, payload } = await send(event, '', 'POST', values);
		if (res.status !== 201) {
			return fail(400, {
				values,
				message: payload?.error?.issues?.[0]?.message ?? payload?.error?.message ?? 'Could not invite.'
			});
		}
		return {
			invited: payload.status === 'invited' ? `Invitation mailed to ${values.email}.` : `${values.email} added.`
		};
	},
	role: async (event) => {
		requireRole(event, event.params.id, 'owner');
		const form = await event.request.formData();
		const { res, payload } = await send(event, `/${encodeURIComponent(String(form.get('userId')))}`, 'PATCH', {
			role: String(form.get('role'))
		});
		if (!res.ok) return fail(400, { message: payload?.error?.message ?? 'Could not change the role.' });
		redirect(303, `/projects/${event.params.id}/members`);
	},
	remove: async (event) => {
		requireRole(event, event.params.id, 'owner');
		const form = await event.request.formData();
		const { res, payload } = await send(event, `/${encodeURIComponent(String(form.get('userId')))}`, 'DELETE');
		if (!res.ok) return fail(400, { message: payload?.error?.message ?? 'Could not remove the member.' });
		redirect(303, `/projects/${event.params.id}/members`);
	}
};
