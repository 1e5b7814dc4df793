// Browser-side calls to the JSON API (DESIGN.md "JSON API"): one shape for
// success and for the contract's error body, so pages can show the server's
// own message and handle a stale `version` (409 with `current`).

export interface ApiIssue {
	path?: (string | number)[];
	message: string;
	row?: number;
	field?: string;
}
export interface ApiFailure {
	ok: false;
	status: number;
	code: string;
	message: string;
	issues: ApiIssue[];
	/** the current object on a 409 stale answer */
	current?: unknown;
}
export type ApiResult<T> = { ok: true; status: number; data: T } | ApiFailure;

export async function apiCall<T>(method: string, url: string, body?: unknown): Promise<ApiResult<T>> {
	let res: Response;
	try {
		res = await fetch(url, {
			method,
			headers: body instanceof FormData || body === undefined ? {} : { 'content-type': 'application/json' },
			body: body instanceof FormData ? body : body === undefined ? undefined : JSON.stringify(body)
		});
	} catch {
		return {
			ok: false,
			status: 0,
			code: 'network',
			message: 'The server could not be reached. Nothing was saved.',
			issues: []
		};
	}
	const text = await res.text();
	let parsed: unknown;
	try {
		parsed = text ? JSON.parse(text) : null;
	} catch {
		parsed = null;
	}
	if (res.ok) return { ok: true, status: res.status, data: parsed as T };
	const err =
		(parsed as { error?: { code?: string; message?: string; issues?: ApiIssue[] }; current?: unknown } | null) ?? {};
	return {
		ok: false,
		status: res.status,
		code: err.error?.code ?? String(res.status),
		message: err.error?.message ?? `The server answered ${res.status}.`,
		issues: err.error?.issues ?? [],
		current: err.current
	};
}

/** One line for a failure, naming the fields the server rejected. */
export function failureText(f: ApiFailure): string {
	if (f.status === 403) return 'Your role in this project may not change this.';
	const detail = f.issues.map((i) => i.message).filter((m) => m && m !== f.message);
	return detail.length ? `${f.message} ${detail.join('; ')}` : f.message;
}
