import { isHttpError, isRedirect, json, type RequestEvent } from '@sveltejs/kit';
import { z, ZodError } from 'zod';
import { readCapped } from './body';
import { DomainError } from './errors';

// The JSON API's edges: one error shape, one body reader with a size limit,
// one wrapper that turns thrown errors into that shape (DESIGN.md "JSON API").

export const MAX_JSON_BYTES = 1024 * 1024;

export interface ApiIssue {
	path: (string | number)[];
	message: string;
}

const CODE_FOR_STATUS: Record<number, string> = {
	400: 'invalid',
	401: 'unauthenticated',
	403: 'forbidden',
	404: 'not-found',
	409: 'conflict',
	410: 'gone',
	413: 'too-large',
	415: 'unsupported-type',
	422: 'unprocessable',
	429: 'rate-limited'
};

export function apiError(
	status: number,
	message: string,
	extra: { code?: string; issues?: unknown[]; [key: string]: unknown } = {}
): Response {
	const { code, issues, ...rest } = extra;
	return json(
		{
			error: { code: code ?? CODE_FOR_STATUS[status] ?? 'error', message, ...(issues ? { issues } : {}) },
			...rest
		},
		// a refused body may be left unread; closing stops the client reusing a connection still carrying it
		{ status, headers: status === 413 ? { connection: 'close' } : {} }
	);
}

/** Thrown by handlers to answer a specific API error. */
export class ApiError extends Error {
	constructor(
		public status: number,
		message: string,
		public extra: { code?: string; issues?: unknown[]; [key: string]: unknown } = {}
	) {
		super(message);
	}
}

/** better-sqlite3's error code, also when the ORM wrapped the error (its `cause`). */
/** Another connection (a large import in a worker thread) held SQLite's write lock. */
export const BUSY_MESSAGE = 'The database is busy with a large write; nothing was changed. Try again in a few seconds.';

export function sqliteCode(err: unknown): unknown {
	const e = err as { code?: unknown; cause?: { code?: unknown } } | null;
	return e?.code ?? e?.cause?.code;
}

export function zodIssues(err: ZodError): ApiIssue[] {
	return err.issues.map((i) => ({
		path: i.path.filter((p): p is string | number => typeof p !== 'symbol'),
		message: i.message
	}));
}

/** The raw body, refusing (413) past `limit` bytes without reading the rest. */

/** Reads a JSON body (≤ 1 MB) and validates it; bad input answers 400 before anything is written. */
export async function readJson<S extends z.ZodType>(
	event: Pick<RequestEvent, 'request'>,
	schema: S
): Promise<z.output<S>> {
	const type = event.request.headers.get('content-type') ?? '';
	if (!type.includes('application/json')) {
		throw new ApiError(415, 'Send JSON with Content-Type: application/json.');
	}
	const text = Buffer.from(await readCapped(event.request, MAX_JSON_BYTES)).toString('utf8');
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		throw new ApiError(400, 'The body is not valid JSON.');
	}
	const parsed = schema.safeParse(body);
	if (!parsed.success) {
		throw new ApiError(400, 'The request is not valid.', { issues: zodIssues(parsed.error) });
	}
	return parsed.data;
}

/** Wraps a +server.ts handler so every refusal answers the contract's error shape. */
export function api<E extends RequestEvent>(
	handler: (event: E) => Promise<Response> | Response
): (event: E) => Promise<Response> {
	return async (event) => {
		try {
			return await handler(event);
		} catch (err) {
			if (err instanceof ApiError) return apiError(err.status, err.message, err.extra);
			if (isHttpError(err)) {
				return apiError(err.status, err.body.message, err.body.code ? { code: err.body.code } : {});
			}
			if (err instanceof DomainError) {
				const issues = err.issues();
				return apiError(err.status, err.message, { code: err.code, ...(issues ? { issues } : {}), ...err.extra() });
			}
			if (err instanceof ZodError) {
				return apiError(400, 'The request is not valid.', { issues: zodIssues(err) });
			}
			if (isRedirect(err)) throw err;
			// another connection (a large import in a worker thread) held the write lock past busy_timeout
			if (sqliteCode(err) === 'SQLITE_BUSY')
				return apiError(503, BUSY_MESSAGE, {
					code: 'busy',
					retryAfter: 5
				});
			throw err;
		}
	};
}
