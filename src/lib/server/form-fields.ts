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
