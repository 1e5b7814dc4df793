import type { RequestHandler } from './$types';
import { apiError } from '$lib/server/api';

// Any /api path no route matches (including a non-numeric id, refused by src/params/int.ts)
// answers the contract's JSON error shape instead of the HTML error page.
const notFound: RequestHandler = () => apiError(404, 'No such API route.', { code: 'not-found' });

export const GET = notFound;
export const POST = notFound;
export const PATCH = notFound;
export const PUT = notFound;
export const DELETE = notFound;
