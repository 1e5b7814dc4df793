import { fail, redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { acceptInvitation, checkInvitation } from '$lib/server/invitations';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params, locals }) => {
	const check = checkInvitation(params.token);
	return {
		signedIn: !!locals.user,
		email: locals.user?.email ?? null,
		invitation: check.ok
			? { projectName: check.projectName, role: check.invitation.role, email: check.invitation.email }
			: null,
		problem: check.ok ? null : check.reason
	};
};

export const actions: Actions = {
	default: (event) => {
		const user = requireUser(event);
		const result = acceptInvitation(event.params.token, user);
		if (!result.ok) return fail(400, { problem: result.reason });
		redirect(303, `/projects/${result.invitation.projectId}`);
	}
};
