import { json } from '@sveltejs/kit';
import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { computeSnapshot, revisionShape, snapshotOf } from '$lib/server/db/revisions';
import { conflictSummary } from '$lib/server/review';
import { revisionOr404 } from '$lib/server/revision-access';
import type { RequestHandler } from './$types';

// One revision: what was stored, and the patch the engine computes from it.
export const GET: RequestHandler = api((event) => {
	const { projectId } = requireRole(event, event.params.pid, 'viewer');
	const row = revisionOr404(projectId, event.params.n);
	const snapshot = snapshotOf(row);
	const { universes, types, receivers, fixtures, conflicts } = computeSnapshot(snapshot);
	return json({
		...revisionShape(row),
		snapshot,
		patch: { universes, types, receivers, fixtures, conflicts, summary: conflictSummary(conflicts) }
	});
});
