// One way to write a date or time. Pages: the reader's locale, date and time in one style, so a page
// never mixes "12/1/2026, 11:54:55 PM" with "2026-12-01". Files and sheets: ISO 8601, which every
// locale and every spreadsheet reads the same way.

type When = Date | string | number;

const toDate = (w: When): Date => (w instanceof Date ? w : new Date(w));

/** "1 Dec 2026, 23:54" in the reader's locale (falls back to the runtime's default). */
export function formatDateTime(w: When, locale?: string): string {
	const d = toDate(w);
	if (Number.isNaN(d.getTime())) return '';
	return new Intl.DateTimeFormat(locale, { dateStyle: 'medium', timeStyle: 'short' }).format(d);
}

/** "1 Dec 2026" in the reader's locale. */
export function formatDate(w: When, locale?: string): string {
	const d = toDate(w);
	if (Number.isNaN(d.getTime())) return '';
	return new Intl.DateTimeFormat(locale, { dateStyle: 'medium' }).format(d);
}

/** ISO 8601 date "2026-12-01" (UTC) for files and printed sheets. */
export function isoDate(w: When): string {
	const d = toDate(w);
	return Number.isNaN(d.getTime()) ? '' : d.toISOString().slice(0, 10);
}

/** ISO 8601 "2026-12-01 23:54Z" (UTC, minutes) for files and printed sheets. */
export function isoDateTime(w: When): string {
	const d = toDate(w);
	return Number.isNaN(d.getTime()) ? '' : `${d.toISOString().slice(0, 16).replace('T', ' ')}Z`;
}

/** "1 fixture", "14 fixtures", "0 errors": a count with its noun in the number it takes (English). */
export function count(n: number, one: string, many = `${one}s`): string {
	return `${n} ${n === 1 ? one : many}`;
}
