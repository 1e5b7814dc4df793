import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { publicBaseUrl } from '$lib/server/config';
import { getProject } from '$lib/server/db/projects';
import { createReviewLink, listReviewLinks } from '$lib/server/db/review-links';
import { queueMail } from '$lib/server/mail/outbox';
import { memberMailByAddress, memberMailBySender, throttle } from '$lib/server/ratelimit';
import { reviewLinkMail } from '$lib/server/mail/templates';
import { revisionOr404 } from '$lib/server/revision-access';
import { reviewLinkCreate } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'programmer');
	return json({ reviewLinks: listReviewLinks(projectId) });
});

/** The token is in the answer's url once; only its hash is kept. */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const input = await readJson(event, reviewLinkCreate);
	const revision = input.revision === 'latest' ? null : revisionOr404(projectId, String(input.revision));
	// mail to an outside address is throttled per sender and per address, before anything is written
	if (input.email) {
		throttle('review-link mails', [
			[memberMailBySender, user.id],
			[memberMailByAddress, input.email.trim().toLowerCase()]
		]);
	}
	const { row, token } = createReviewLink(projectId, user.id, {
		revisionId: revision?.id ?? null,
		expiresInDays: input.expiresInDays,
		label: input.email ?? ''
	});
	const url = `${publicBaseUrl()}/review/${token}`;
	let mailed: boolean | undefined;
	if (input.email) {
		queueMail(
			reviewLinkMail(input.email, {
				projectName: getProject(projectId)?.name ?? '',
				revision: revision?.number ?? 'latest',
				sentBy: user.email,
				expiresAt: row.expiresAt,
				url
			}),
			{ projectId, kind: 'review-link' }
		);
		mailed = true;
	}
	return json(
		{
			id: row.id,
			url,
			expiresAt: row.expiresAt?.toISOString() ?? null,
			revision: revision?.number ?? 'latest',
			...(mailed === undefined ? {} : { mailed })
		},
		{ status: 201 }
	);
});
