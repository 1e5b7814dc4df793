import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { resolveToken, signOff, throttleSignoff } from '$lib/server/review';
import { linkSignoff } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

// No account: the token authorizes signing off its own revision, under the name given.
export const POST: RequestHandler = api(async (event) => {
	throttleSignoff(event.getClientAddress());
	const { link, revision } = resolveToken(event);
	const input = await readJson(event, linkSignoff);
	const stored = await signOff(revision, { ...input, reviewLinkId: link.id });
	return json(stored, { status: 201 });
});
