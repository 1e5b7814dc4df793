import { error, fail, redirect } from '@sveltejs/kit';
import type { DescribedChanges, PatchDiff } from '$lib/patch';
import type { PatchData } from '$lib/server/db/patch';
import type { RevisionShape } from '$lib/server/db/revisions';
import type { Actions, PageServerLoad } from './$types';

// No account here: the token in the path is the authorization, checked by the
// /api/review routes this page calls (they rate-limit and scope to one revision).

export interface ReviewData {
	project: { name: string; venue: string; startsOn: string | null; endsOn: string | null };
	link: { revision: number | 'latest'; expiresAt: string | null };
	revision: RevisionShape;
	patch: Omit<PatchData, 'project'> & { summary: { errors: number; warnings: number; info: number } };
	diff: (PatchDiff & { since: number; changes: DescribedChanges }) | null;
}

export const load: PageServerLoad = async (event) => {
	const res = await event.fetch(`/api/review/${encodeURIComponent(event.params.token)}`);
	const body = await res.json();
	if (!res.ok)
		error(res.status, { message: body?.error?.message ?? 'This review link does not work.', code: body?.error?.code });
	return { review: body as ReviewData, signed: event.url.searchParams.get('signed') };
};

export const actions: Actions = {
	signoff: async (event) => {
		const form = await event.request.formData();
		const values = {
			name: String(form.get('name') ?? ''),
			decision: String(form.get('decision') ?? ''),
			comment: String(form.get('comment') ?? '')
		};
		const res = await event.fetch(`/api/review/${encodeURIComponent(event.params.token)}/signoff`, {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(values)
		});
		if (res.status !== 201) {
			const body = await res.json();
			const message = body?.error?.issues?.[0]?.message ?? body?.error?.message ?? 'Could not sign off.';
			return fail(res.status === 400 ? 400 : res.status, { values, message });
		}
		redirect(303, `/review/${event.params.token}?signed=${values.decision}`);
	}
};
