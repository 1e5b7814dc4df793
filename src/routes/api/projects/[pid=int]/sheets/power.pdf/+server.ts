import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { getProject } from '$lib/server/db/projects';
import { loadPower } from '$lib/server/db/power';
import { parseSheetQuery, sheetFileName } from '$lib/server/pdf/respond';
import { renderPowerSheet } from '$lib/server/pdf/power-sheet';
import type { RequestHandler } from './$types';

// The power sheet prints the live plan: packs and circuits are not part of a revision snapshot.
export const GET: RequestHandler = api(async (event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const query = parseSheetQuery(event.url.searchParams, 'patch');
	const project = getProject(projectId)!;
	const pdf = await renderPowerSheet(
		loadPower(projectId),
		{
			sheet: 'Power sheet',
			project: project.name,
			revision: 'Draft — current plan, not a revision',
			printed: new Date().toISOString().slice(0, 10),
			signoff: 'none (a power plan is not part of a revision)'
		},
		query.paper
	);
	const name = sheetFileName('patch', project.name, null).replace(/-patch-draft\.pdf$/, '-power-draft.pdf');
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="${name}"`,
			'content-length': String(pdf.length),
			'cache-control': 'private, no-store'
		}
	});
});
