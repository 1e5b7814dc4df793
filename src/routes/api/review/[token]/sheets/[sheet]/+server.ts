import { api, ApiError } from '$lib/server/api';
import { parseSheetQuery, renderSheet, type SheetKind } from '$lib/server/pdf/respond';
import { resolveToken } from '$lib/server/review';
import type { RequestHandler } from './$types';

const SHEETS: Record<string, SheetKind> = { 'patch.pdf': 'patch', 'labels.pdf': 'labels', 'radio.pdf': 'radio' };

// A review-link holder prints the sheets of the link's revision and no other:
// a ?revision= in the query is ignored in favour of the token's own.
export const GET: RequestHandler = api((event) => {
	const kind = SHEETS[event.params.sheet];
	if (!kind) throw new ApiError(404, 'No such sheet: use patch.pdf, labels.pdf or radio.pdf.');
	const { revision } = resolveToken(event);
	const query = parseSheetQuery(event.url.searchParams, kind);
	return renderSheet(revision.projectId, kind, { ...query, revision: revision.number });
});
