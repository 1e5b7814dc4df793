// The one shape a failed form action answers (`fail(status, FormFailure)`), read by pages
// without casts, and the one helper that turns issues into per-field messages.

export interface FormIssue {
	path: (string | number)[];
	message: string;
}

export interface FormFailure {
	/** a sentence for the whole form */
	message: string;
	/** per-field problems; `fieldErrors()` keys them by dotted path */
	issues: FormIssue[];
	/** what was typed, so the form keeps its input (passwords are never echoed) */
	values: Record<string, string>;
	/** which named action failed, when a page has several forms */
	action?: string;
}

/** `[{ path: ['control', 'address'], message }]` → `{ 'control.address': message }` (first message wins). */
export function fieldErrors(issues: readonly FormIssue[] | undefined): Record<string, string> {
	const out: Record<string, string> = {};
	for (const issue of issues ?? []) {
		const key = issue.path.join('.') || '_';
		out[key] ??= issue.message;
	}
	return out;
}
