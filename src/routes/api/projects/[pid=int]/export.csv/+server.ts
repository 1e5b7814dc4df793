import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { getProject } from '$lib/server/db/projects';
import { exportPatchCsv } from '$lib/server/export/csv';
import { downloadName } from '$lib/server/export/json';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const name = downloadName(getProject(projectId)!.name, 'patch', 'csv');
	// ?bom=true: a UTF-8 byte-order mark first, which some desktop spreadsheet programs need to read
	// the file as UTF-8 (accents, °, µ); off by default because other tools show it as stray characters
	const bom = event.url.searchParams.get('bom') === 'true' ? '\uFEFF' : '';
	return new Response(bom + exportPatchCsv(projectId), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="${name}"`,
			'cache-control': 'no-store'
		}
	});
});
