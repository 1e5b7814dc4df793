// The one error model below the HTTP edge (DEVELOPERS.md "Errors"). The database layer, imports,
// mail and rules throw these; `api()` (src/lib/server/api.ts) turns them into the JSON error shape
// and `action()` (src/lib/server/forms.ts) into `fail(status, FormFailure)`. Nothing below the routes
// knows about HTTP; the status each kind maps to lives here, once.

export interface FieldIssue {
	/** where the problem is: zod's path into the input, e.g. ['control', 'address'] */
	path: (string | number)[];
	message: string;
	/** CSV imports: the 1-based data row */
	row?: number;
	field?: string;
}

/** An uploaded file's problem where a path means nothing: the spreadsheet row (1-based, header = 1) and column. */
export interface RowIssue {
	row: number | null;
	field: string;
	message: string;
}

export type Issue = FieldIssue | RowIssue;

/** What an error may carry besides its message; every kind accepts it as its last argument. */
export interface ErrorDetail {
	/** a finer code than the kind's own, for clients that branch on it (e.g. 'zip-path' for an invalid upload) */
	code?: string;
	/** problems a form can show beside its fields */
	issues?: readonly Issue[];
	/** extra top-level members of the JSON error answer (e.g. `stale: [ids]`) */
	extra?: Record<string, unknown>;
}

export abstract class DomainError extends Error {
	abstract readonly status: number;
	/** the kind's code; `detail.code` may refine it */
	protected abstract readonly kind: string;
	constructor(
		message: string,
		protected readonly detail: ErrorDetail = {}
	) {
		super(message);
		this.name = new.target.name;
	}
	get code(): string {
		return this.detail.code ?? this.kind;
	}
	/** extra top-level members of the JSON error answer (e.g. `current`, `usedBy`) */
	extra(): Record<string, unknown> {
		return this.detail.extra ?? {};
	}
	issues(): Issue[] | undefined {
		return this.detail.issues ? [...this.detail.issues] : undefined;
	}
}

/** No such row in this project (or not the caller's): 404, never revealing more. */
export class NotFoundError extends DomainError {
	readonly status = 404;
	protected readonly kind = 'not-found';
}

/** Input that breaks a rule the schema cannot see (dates out of order, a footprint past 512 …). */
export class InvalidError extends DomainError {
	readonly status: number = 400;
	protected readonly kind: string = 'invalid';
	constructor(message: string, issues?: ErrorDetail['issues'], detail: Omit<ErrorDetail, 'issues'> = {}) {
		super(message, { ...detail, ...(issues ? { issues } : {}) });
	}
}

/** A file that was read but cannot be used (an import's rows): 422 with every problem named. */
export class UnprocessableError extends InvalidError {
	override readonly status = 422;
	protected override readonly kind = 'unprocessable';
}

/** A unique thing already exists (fixture number, universe number, maker + model). */
export class DuplicateError extends DomainError {
	readonly status = 409;
	protected readonly kind = 'duplicate';
	constructor(message: string, issues?: ErrorDetail['issues'], detail: Omit<ErrorDetail, 'issues'> = {}) {
		super(message, { ...detail, ...(issues ? { issues } : {}) });
	}
}

/** A write carried a `version` older than the row's: the caller must re-read. */
export class StaleVersionError extends DomainError {
	readonly status = 409;
	protected readonly kind = 'stale';
	constructor(
		public current: unknown,
		message = 'Someone else changed this since you read it.',
		extra: Record<string, unknown> = {}
	) {
		super(message, { extra: { ...extra, current } });
	}
}

/** A delete or change refused because other rows depend on the target. */
export class InUseError extends DomainError {
	readonly status = 409;
	protected readonly kind = 'in-use';
	constructor(
		message: string,
		public usedBy: unknown[]
	) {
		super(message, { extra: { usedBy } });
	}
}

/** A rule of the domain refuses the change (the last owner leaving, a follow cycle …). */
export class RefusedError extends DomainError {
	readonly status = 409;
	protected readonly kind = 'refused';
}

/** The caller's role or relation does not allow this (beyond requireRole's own 403). */
export class ForbiddenError extends DomainError {
	readonly status = 403;
	protected readonly kind = 'forbidden';
}

/** Expired or revoked (review links, invitations). */
export class GoneError extends DomainError {
	readonly status = 410;
	protected readonly kind = 'gone';
}

export class TooLargeError extends DomainError {
	readonly status = 413;
	protected readonly kind = 'too-large';
}

export class UnsupportedTypeError extends DomainError {
	readonly status = 415;
	protected readonly kind = 'unsupported-type';
}

/** A throttle: say when to come back (when known) instead of pretending the input is wrong. */
export class RateLimitedError extends DomainError {
	readonly status = 429;
	protected readonly kind = 'rate-limited';
	constructor(
		message: string,
		public retryAfterSeconds?: number
	) {
		super(message, retryAfterSeconds === undefined ? {} : { extra: { retryAfter: retryAfterSeconds } });
	}
}

/** The disk is full: nothing was kept. */
export class InsufficientStorageError extends DomainError {
	readonly status = 507;
	protected readonly kind = 'insufficient-storage';
}

/**
 * A worker job's refusal or budget stop, carried back across the thread boundary with the status
 * the worker's own error had (413/415/422…), so code below the routes (a restore preview) can
 * catch it like any other domain error.
 */
export class JobRefusedError extends DomainError {
	protected readonly kind = 'refused';
	constructor(
		readonly status: number,
		message: string,
		detail: ErrorDetail = {}
	) {
		super(message, detail);
	}
}
