import { json } from '@sveltejs/kit';
import { api, ApiError } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { diffSnapshots, liveSnapshot, snapshotOf } from '$lib/server/db/revisions';
import { revisionOr404 } from '$lib/server/revision-access';
import type { RequestHandler } from './$types';

/**
 * `?against=m`: what changed from revision m to revision n.
 * `?against=live`: what changed in the draft since revision n.
 */
export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const row = revisionOr404(projectId, event.params.n);
	const against = event.url.searchParams.get('against');
	if (!against) throw new ApiError(400, 'Say what to compare with: ?against=<revision number> or ?against=live.');
	if (against === 'live') {
		return json({
			before: { revision: row.number },
			after: { revision: 'live' },
			...diffSnapshots(snapshotOf(row), liveSnapshot(projectId))
		});
	}
	const other = revisionOr404(projectId, against);
	return json({
		before: { revision: other.number },
		after: { revision: row.number },
		...diffSnapshots(snapshotOf(other), snapshotOf(row))
	});
});
