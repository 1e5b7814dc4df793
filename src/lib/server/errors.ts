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

export abstract class DomainError extends Error {
	abstract readonly status: number;
	abstract readonly code: string;
	/** extra top-level members of the JSON error answer (e.g. `current`, `usedBy`) */
	extra(): Record<string, unknown> {
		return {};
	}
	issues(): FieldIssue[] | undefined {
		return undefined;
	}
}

/** No such row in this project (or not the caller's): 404, never revealing more. */
export class NotFoundError extends DomainError {
	readonly status = 404;
	readonly code = 'not-found';
}

/** Input that breaks a rule the schema cannot see (dates out of order, a footprint past 512 …). */
export class InvalidError extends DomainError {
	readonly status: number = 400;
	readonly code: string = 'invalid';
	constructor(
		message: string,
		private readonly fieldIssues: FieldIssue[] = []
	) {
		super(message);
	}
	override issues() {
		return this.fieldIssues;
	}
}

/** A file that was read but cannot be used (an import's rows): 422 with every problem named. */
export class UnprocessableError extends InvalidError {
	override readonly status = 422;
	override readonly code = 'unprocessable';
}

/** A unique thing already exists (fixture number, universe number, maker + model). */
export class DuplicateError extends DomainError {
	readonly status = 409;
	readonly code = 'duplicate';
	constructor(
		message: string,
		private readonly fieldIssues: FieldIssue[] = []
	) {
		super(message);
	}
	override issues() {
		return this.fieldIssues.length ? this.fieldIssues : undefined;
	}
}

/** A write carried a `version` older than the row's: the caller must re-read. */
export class StaleVersionError extends DomainError {
	readonly status = 409;
	readonly code = 'stale';
	constructor(public current: unknown) {
		super('Someone else changed this since you read it.');
	}
	override extra() {
		return { current: this.current };
	}
}

/** A delete or change refused because other rows depend on the target. */
export class InUseError extends DomainError {
	readonly status = 409;
	readonly code = 'in-use';
	constructor(
		message: string,
		public usedBy: unknown[]
	) {
		super(message);
	}
	override extra() {
		return { usedBy: this.usedBy };
	}
}

/** A rule of the domain refuses the change (the last owner leaving, a follow cycle …). */
export class RefusedError extends DomainError {
	readonly status = 409;
	readonly code = 'refused';
}

/** The caller's role or relation does not allow this (beyond requireRole's own 403). */
export class ForbiddenError extends DomainError {
	readonly status = 403;
	readonly code = 'forbidden';
}

/** Expired or revoked (review links, invitations). */
export class GoneError extends DomainError {
	readonly status = 410;
	readonly code = 'gone';
}

export class TooLargeError extends DomainError {
	readonly status = 413;
	readonly code = 'too-large';
}

export class UnsupportedTypeError extends DomainError {
	readonly status = 415;
	readonly code = 'unsupported-type';
}

/** A throttle: say when to come back instead of pretending the input is wrong. */
export class RateLimitedError extends DomainError {
	readonly status = 429;
	readonly code = 'rate-limited';
	constructor(
		message: string,
		public retryAfterSeconds: number
	) {
		super(message);
	}
	override extra() {
		return { retryAfter: this.retryAfterSeconds };
	}
}

/** The disk is full: nothing was kept. */
export class InsufficientStorageError extends DomainError {
	readonly status = 507;
	readonly code = 'insufficient-storage';
}
