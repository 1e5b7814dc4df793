import { json } from '@sveltejs/kit';
import { api, ApiError, readJson } from '$lib/server/api';
import { signoffByIp } from '$lib/server/ratelimit';
import { resolveToken, signOff } from '$lib/server/review';
import { linkSignoff } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

// No account: the token authorizes signing off its own revision, under the name given.
export const POST: RequestHandler = api(async (event) => {
	if (!signoffByIp.hit(event.getClientAddress()))
		throw new ApiError(429, 'Too many sign-offs from your address; wait a minute.');
	const { link, revision } = resolveToken(event);
	const input = await readJson(event, linkSignoff);
	const stored = await signOff(revision, { ...input, reviewLinkId: link.id });
	return json(stored, { status: 201 });
});
