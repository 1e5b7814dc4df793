import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/authz';
import { findUserById } from '$lib/server/db/users';
import { action } from '$lib/server/forms';
import { acceptInvitation, checkInvitation } from '$lib/server/invitations';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ params, locals }) => {
	const check = checkInvitation(params.token);
	return {
		signedIn: !!locals.user,
		email: locals.user?.email ?? null,
		verified: locals.user ? !!findUserById(locals.user.id)?.emailVerified : false,
		invitation: check.ok
			? { projectName: check.projectName, role: check.invitation.role, email: check.invitation.email }
			: null,
		problem: check.ok ? null : check.reason
	};
};

export const actions: Actions = {
	default: action('accept', (event) => {
		const user = requireUser(event);
		const invitation = acceptInvitation(event.params.token, user);
		redirect(303, `/projects/${invitation.projectId}`);
	})
};
