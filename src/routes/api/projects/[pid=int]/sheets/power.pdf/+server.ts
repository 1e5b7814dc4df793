import { api } from '$lib/server/api';
import { sheetResponse } from '$lib/server/pdf/respond';
import type { RequestHandler } from './$types';

// The power sheet prints the live plan: packs and circuits are not part of a revision snapshot.
export const GET: RequestHandler = api((event) => sheetResponse(event, 'power'));
