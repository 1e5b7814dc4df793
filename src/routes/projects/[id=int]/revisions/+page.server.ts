import { fail, redirect } from '@sveltejs/kit';
import type { DescribedChanges, PatchDiff } from '$lib/patch';
import { requireRole, roleAtLeast } from '$lib/server/authz';
import type { ReviewLinkShape } from '$lib/server/db/review-links';
import type { RevisionShape } from '$lib/server/db/revisions';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

type Diff = PatchDiff & { changes: DescribedChanges } & {
	before: { revision: number };
	after: { revision: number | 'live' };
};

export const load: PageServerLoad = async (event) => {
	const { role } = requireRole(event, event.params.id, 'viewer');
	const base = `/api/projects/${event.params.id}`;
	const canEdit = roleAtLeast(role, 'programmer');
	const from = event.url.searchParams.get('from');
	const to = event.url.searchParams.get('to');
	const [revisionsRes, linksRes, diffRes] = await Promise.all([
		event.fetch(`${base}/revisions`),
		canEdit ? event.fetch(`${base}/review-links`) : null,
		from && to
			? event.fetch(`${base}/revisions/${encodeURIComponent(to)}/diff?against=${encodeURIComponent(from)}`)
			: null
	]);
	const { revisions } = (await revisionsRes.json()) as { revisions: RevisionShape[] };
	const links = linksRes ? ((await linksRes.json()) as { reviewLinks: ReviewLinkShape[] }).reviewLinks : [];
	const diffBody = diffRes ? await diffRes.json() : null;
	const latest = revisions[0]?.number ?? null;
	// the newest approval before the latest revision: what the producer last agreed to
	const approved =
		revisions.find((r) => r.number !== latest && r.signoffs.some((s) => s.decision === 'approved'))?.number ?? null;
	return {
		revisions,
		links,
		canEdit,
		latest,
		approved,
		diff: diffRes?.ok ? (diffBody as Diff) : null,
		diffError: diffRes && !diffRes.ok ? (diffBody?.error?.message as string) : null,
		from,
		to
	};
};

async function call(event: RequestEvent, path: string, method: string, body?: unknown) {
	const res = await event.fetch(`/api/projects/${event.params.id}${path}`, {
		method,
		headers: { 'content-type': 'application/json' },
		body: body === undefined ? undefined : JSON.stringify(body)
	});
	const payload = res.status === 204 ? null : await res.json();
	const message: string = payload?.error?.issues?.[0]?.message ?? payload?.error?.message ?? '';
	return { res, payload, message };
}

export const actions: Actions = {
	revise: async (event) => {
		requireRole(event, event.params.id, 'programmer');
		const note = String((await event.request.formData()).get('note') ?? '');
		const { res, message } = await call(event, '/revisions', 'POST', { note });
		if (res.status !== 201)
			return fail(400, { action: 'revise', note, message: message || 'Could not make the revision.' });
		redirect(303, `/projects/${event.params.id}/revisions`);
	},
	link: async (event) => {
		requireRole(event, event.params.id, 'programmer');
		const form = await event.request.formData();
		const values = {
			revision: String(form.get('revision') ?? 'latest'),
			expiresInDays: String(form.get('expiresInDays') ?? '30'),
			email: String(form.get('email') ?? '').trim()
		};
		const body = {
			revision: values.revision === 'latest' ? 'latest' : Number(values.revision),
			expiresInDays: values.expiresInDays === 'never' ? null : Number(values.expiresInDays),
			...(values.email ? { email: values.email } : {})
		};
		const { res, payload, message } = await call(event, '/review-links', 'POST', body);
		if (res.status !== 201)
			return fail(400, { action: 'link', linkValues: values, message: message || 'Could not make the link.' });
		// the one time the token is shown: it is not stored, so it cannot be shown again
		return {
			created: payload as { id: number; url: string; expiresAt: string | null; mailed?: boolean },
			mailedTo: values.email
		};
	},
	revoke: async (event) => {
		requireRole(event, event.params.id, 'programmer');
		const id = String((await event.request.formData()).get('id') ?? '');
		const { res, message } = await call(event, `/review-links/${encodeURIComponent(id)}`, 'DELETE');
		if (res.status !== 204) return fail(400, { action: 'revoke', message: message || 'Could not revoke the link.' });
		redirect(303, `/projects/${event.params.id}/revisions`);
	},
	signoff: async (event) => {
		requireRole(event, event.params.id, 'viewer');
		const form = await event.request.formData();
		const values = {
			revision: String(form.get('revision') ?? ''),
			decision: String(form.get('decision') ?? ''),
			comment: String(form.get('comment') ?? '')
		};
		const { res, message } = await call(event, `/revisions/${encodeURIComponent(values.revision)}/signoffs`, 'POST', {
			decision: values.decision,
			comment: values.comment
		});
		if (res.status !== 201)
			return fail(400, { action: 'signoff', signValues: values, message: message || 'Could not sign off.' });
		redirect(303, `/projects/${event.params.id}/revisions`);
	}
};
