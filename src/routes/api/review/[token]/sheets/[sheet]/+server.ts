import { api, ApiError } from '$lib/server/api';
import { parseSheetQuery, renderSheet, type PatchSheetKind } from '$lib/server/pdf/respond';
import { resolveToken } from '$lib/server/review';
import type { RequestHandler } from './$types';

const SHEETS: Record<string, PatchSheetKind> = { 'patch.pdf': 'patch', 'labels.pdf': 'labels', 'radio.pdf': 'radio' };

// A review-link holder prints the sheets of the link's revision and no other:
// a ?revision= in the query is ignored in favour of the token's own.
export const GET: RequestHandler = api((event) => {
	// own keys only: a sheet named constructor or __proto__ is no sheet
	const kind = Object.hasOwn(SHEETS, event.params.sheet) ? SHEETS[event.params.sheet] : undefined;
	if (!kind) throw new ApiError(404, 'No such sheet: use patch.pdf, labels.pdf or radio.pdf.');
	const { revision, link } = resolveToken(event);
	const query = parseSheetQuery(event.url.searchParams, kind);
	// the link is the one who prints: everyone holding it shares its two jobs in flight
	return renderSheet(revision.projectId, kind, { ...query, revision: revision.number }, `review-link:${link.id}`);
});
