import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { revisionDiff } from '$lib/server/revision-access';
import type { RequestHandler } from './$types';

/**
 * `?against=m`: what changed from revision m to revision n.
 * `?against=live`: what changed in the draft since revision n.
 */
export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	return json(revisionDiff(projectId, event.params.n, event.url.searchParams.get('against')));
});
