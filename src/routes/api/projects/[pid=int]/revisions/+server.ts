import { json } from '@sveltejs/kit';
import { api, readJson } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { createRevision, listRevisions, revisionShape } from '$lib/server/db/revisions';
import { notifyLatestLinks } from '$lib/server/review';
import { revisionCreate } from '$lib/schemas/revision';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json({ revisions: listRevisions(projectId) });
});

/** Snapshots the whole live patch as the next revision. */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const { note } = await readJson(event, revisionCreate);
	const row = createRevision(projectId, user, note);
	await notifyLatestLinks(row);
	return json(revisionShape(row), { status: 201 });
});
