import { redirect } from '@sveltejs/kit';
import type { DescribedChanges, PatchDiff } from '$lib/patch';
import { action, loader } from '$lib/server/forms';
import type { PatchData } from '$lib/server/db/patch';
import type { RevisionShape } from '$lib/server/db/revisions';
import type { LinkDecision } from '$lib/server/db/signoffs';
import { InvalidError } from '$lib/server/errors';
import { zodIssues } from '$lib/server/api';
import { resolveToken, reviewPayload, signOff, throttleSignoff } from '$lib/server/review';
import { linkSignoff } from '$lib/schemas/revision';
import type { Actions, PageServerLoad } from './$types';

// No account here: the token in the path is the authorization. The page calls what the
// /api/review routes call (the same throttles, the same one-revision scope), without a second trip.

export interface ReviewData {
	project: { name: string; venue: string; startsOn: string | null; endsOn: string | null };
	/** `signoff`: what this link already decided on this revision; the page then shows it instead of the form */
	link: { revision: number | 'latest'; expiresAt: string | null; signoff: LinkDecision | null };
	revision: RevisionShape;
	patch: Omit<PatchData, 'project'> & { summary: { errors: number; warnings: number; info: number } };
	diff: (PatchDiff & { since: number; changes: DescribedChanges }) | null;
}

export const load: PageServerLoad = loader((event) => {
	const { link, revision } = resolveToken(event);
	const review: ReviewData = reviewPayload(link, revision);
	return { review, signed: event.url.searchParams.get('signed') };
});

export const actions: Actions = {
	signoff: action('signoff', async (event, form) => {
		throttleSignoff(event.getClientAddress());
		const { link, revision } = resolveToken(event);
		const values = {
			name: String(form.get('name') ?? ''),
			decision: String(form.get('decision') ?? ''),
			comment: String(form.get('comment') ?? '')
		};
		const parsed = linkSignoff.safeParse(values);
		// the page shows one sentence above the form: the first problem, in plain words
		if (!parsed.success) {
			const issues = zodIssues(parsed.error);
			throw new InvalidError(issues[0]?.message ?? 'Some fields need fixing.', issues);
		}
		await signOff(revision, { ...parsed.data, reviewLinkId: link.id });
		redirect(303, `/review/${event.params.token}?signed=${parsed.data.decision}`);
	})
};
