import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { getProject } from '$lib/server/db/projects';
import { downloadName, exportProject } from '$lib/server/export/json';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const name = downloadName(getProject(projectId)!.name, 'project', 'json');
	return new Response(JSON.stringify(exportProject(projectId), null, 2), {
		headers: {
			'content-type': 'application/json; charset=utf-8',
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'no-store'
		}
	});
});
