import { api } from '$lib/server/api';
import { sheetResponse } from '$lib/server/pdf/respond';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = api((event) => sheetResponse(event, 'radio'));
