import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { importUpload, wantsApply } from '$lib/server/import/index';
import { readUpload } from '$lib/server/import/multipart';
import { publish } from '$lib/server/live';
import type { RequestHandler } from './$types';

/** Multipart field `file`: a .csv patch or a .gdtf fixture type. Previews unless apply=true (query or form field). */
export const POST: RequestHandler = api(async (event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'programmer');
	const upload = await readUpload(event);
	const summary = await importUpload(projectId, user.id, upload, wantsApply(event.url, upload.fields));
	if (summary.applied) publish(projectId, { by: user.id, refetch: true });
	const status = summary.applied ? 201 : 200;
	// a CSV import's summary comes from the worker already as JSON
	if ('json' in summary) return new Response(summary.json, { status, headers: { 'content-type': 'application/json' } });
	return json(summary, { status });
});
