import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { resolveToken, reviewPayload } from '$lib/server/review';
import type { RequestHandler } from './$types';

// No account: the token is the authorization, for its one revision only.
export const GET: RequestHandler = api((event) => {
	const { link, revision } = resolveToken(event);
	return json(reviewPayload(link, revision));
});
