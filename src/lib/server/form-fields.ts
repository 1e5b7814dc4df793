import { ApiError } from './api';
import { DomainError, type FieldIssue } from './errors';

// Form fields arrive as strings; these turn them into the values the shared zod schemas expect,
// leaving anything unreadable for the schema to refuse in words (src/lib/messages.ts).

/** Trimmed text, or undefined when the field was not sent. */
export function text(form: FormData, key: string): string | undefined {
	const v = form.get(key);
	return typeof v === 'string' ? v : undefined;
}

/** A number field: '' and absent are undefined (the schema says "required"), other text becomes NaN. */
export function num(form: FormData, key: string): number | undefined {
	const v = text(form, key)?.trim();
	if (v === undefined || v === '') return undefined;
	return /^-?\d+(\.\d+)?$/.test(v) ? Number(v) : Number.NaN;
}

/** The id of the row a form acts on; a missing or broken one is simply not found. */
export function rowId(form: FormData, key = 'id'): number {
	const n = num(form, key);
	return n !== undefined && Number.isSafeInteger(n) && n > 0 ? n : 0;
}

/** An `ApiError` still thrown by a db function, carried as a domain error so `action()` keeps the form. */
class CarriedApiError extends DomainError {
	constructor(
		readonly status: number,
		readonly code: string,
		message: string,
		private readonly carried: FieldIssue[] | undefined
	) {
		super(message);
	}
	override issues() {
		return this.carried;
	}
}

/** Runs a db call; the few db functions that still throw `ApiError` answer like domain errors. */
export function domain<T>(fn: () => T): T {
	try {
		return fn();
	} catch (err) {
		if (err instanceof ApiError)
			throw new CarriedApiError(
				err.status,
				err.extra.code ?? 'invalid',
				err.message,
				err.extra.issues as FieldIssue[] | undefined
			);
		throw err;
	}
}
