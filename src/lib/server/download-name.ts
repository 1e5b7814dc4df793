// The one way a download is named (CSV, JSON backup, every PDF sheet): the project's name as a slug
// and what the file is. Letters and digits only, so the name needs no quoting in Content-Disposition.

/** "Café Müller — night unit" → "cafe-muller-night-unit": accents dropped, dashes between words, ≤ 60 characters. */
export function slugify(name: string): string {
	const slug = name
		// NFKD splits "é" into "e" and a combining accent (Unicode UAX #15), which the next step drops
		.normalize('NFKD')
		.replace(/[\u0300-\u036f]/g, '')
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-+|-+$/g, '')
		.slice(0, 60)
		.replace(/-+$/g, '');
	return slug || 'project';
}

/** `<project-slug>-<what>.<ext>`, e.g. `cafe-muller-patch.csv`, `cafe-muller-patch-r3.pdf`. */
export function downloadName(projectName: string, what: string, ext: string): string {
	return `${slugify(projectName)}-${what}.${ext}`;
}
