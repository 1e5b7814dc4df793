import { describe, expect, it } from 'vitest';
import { downloadName, slugify } from '../../src/lib/server/download-name';
import { downloadName as exportDownloadName } from '../../src/lib/server/export/json';
import { sheetFileName } from '../../src/lib/server/pdf/respond';

// One slug for every download (issue 17): the CSV export, the JSON backup and every PDF sheet named
// the same way, accents folded to their base letters (Unicode NFKD, UAX #15).

describe('download names', () => {
	it('fold "Café Müller" to cafe-muller in the CSV, the backup and every sheet alike', () => {
		expect(slugify('Café Müller')).toBe('cafe-muller');
		expect(exportDownloadName('Café Müller', 'patch', 'csv')).toBe('cafe-muller-patch.csv');
		expect(exportDownloadName('Café Müller', 'project', 'json')).toBe('cafe-muller-project.json');
		for (const kind of ['patch', 'labels', 'radio', 'power'] as const)
			expect(sheetFileName(kind, 'Café Müller', null)).toBe(`cafe-muller-${kind}-draft.pdf`);
		expect(sheetFileName('patch', 'Café Müller', 3)).toBe('cafe-muller-patch-r3.pdf');
	});

	it('keep only letters, digits and single dashes, at most 60 characters, never empty', () => {
		expect(downloadName('Ça va? Öl & Tee', 'patch', 'csv')).toBe('ca-va-ol-tee-patch.csv');
		expect(slugify('  "quoted"; filename=evil.exe ')).toBe('quoted-filename-evil-exe');
		expect(slugify('———')).toBe('project');
		expect(slugify('日本語')).toBe('project');
		const long = slugify('a '.repeat(100));
		expect(long.length).toBeLessThanOrEqual(60);
		expect(long).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
	});
});
