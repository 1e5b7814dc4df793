import { error, fail, isHttpError, isRedirect, type ActionFailure, type RequestEvent } from '@sveltejs/kit';
import { z, ZodError } from 'zod';
import type { FormFailure } from '../forms';
import { BUSY_MESSAGE, sqliteCode, zodIssues } from './api';
import { DomainError, InvalidError, type Issue } from './errors';

// The one form pattern (DEVELOPERS.md "Forms"): a named action wrapped in `action()` reads the form
// once, validates it with the zod schema the API uses, calls the same db function the API handler
// calls, and answers every domain error as `fail(status, FormFailure)` so the page keeps its input.

const SECRET = /password|token|secret/i;

/** The form's fields as strings (a repeated name keeps its last value; files are skipped). */
export function formValues(form: FormData): Record<string, string> {
	const values: Record<string, string> = {};
	for (const [key, value] of form) if (typeof value === 'string') values[key] = value;
	return values;
}

/** Row issues of uploads become field issues keyed by their column, with the row in the message. */
function formIssues(issues: Issue[]): FormFailure['issues'] {
	return issues.map((i) =>
		'path' in i ? i : { path: [i.field], message: i.row === null ? i.message : `Row ${i.row}: ${i.message}` }
	);
}

/** Validates input with a shared schema; failures throw InvalidError with the field issues. */
export function parseWith<S extends z.ZodType>(schema: S, input: unknown): z.output<S> {
	const parsed = schema.safeParse(input);
	if (!parsed.success) {
		const issues = zodIssues(parsed.error);
		// one problem reads best as itself; several get a summary and their fields' own messages
		throw new InvalidError(issues.length === 1 ? issues[0].message : 'Some fields need fixing.', issues);
	}
	return parsed.data;
}

export type ActionHandler<E extends RequestEvent, R> = (event: E, form: FormData) => Promise<R> | R;

/** Wraps a named action: domain and validation errors become `fail(status, FormFailure)`. */
export function action<E extends RequestEvent, R>(
	name: string,
	handler: ActionHandler<E, R>
): (event: E) => Promise<R | ActionFailure<FormFailure>> {
	return async (event) => {
		const form = await event.request.formData();
		try {
			return await handler(event, form);
		} catch (err) {
			if (isRedirect(err) || isHttpError(err)) throw err;
			const values = Object.fromEntries(Object.entries(formValues(form)).filter(([k]) => !SECRET.test(k)));
			if (err instanceof DomainError) {
				return fail(err.status, { message: err.message, issues: formIssues(err.issues() ?? []), values, action: name });
			}
			if (err instanceof ZodError) {
				return fail(400, { message: 'Some fields need fixing.', issues: zodIssues(err), values, action: name });
			}
			if (sqliteCode(err) === 'SQLITE_BUSY')
				return fail(503, { message: BUSY_MESSAGE, issues: [], values, action: name });
			throw err;
		}
	};
}

/**
 * Wraps a server load that calls db functions: a domain error (no such revision, a gone link …)
 * shows the page's error view with its status and message instead of a 500.
 */
export function loader<E extends RequestEvent, R>(load: (event: E) => Promise<R> | R): (event: E) => Promise<R> {
	return async (event) => {
		try {
			return await load(event);
		} catch (err) {
			if (err instanceof DomainError) error(err.status, { message: err.message, code: err.code });
			throw err;
		}
	};
}
