// Printed sheets, rendered in-process through the same code the routes use:
// the patch sheet of a 2,000-fixture rig and 500 labels with QR codes.
import { renderLabelSheet } from '../../src/lib/server/pdf/label-sheet';
import { renderPatchSheet } from '../../src/lib/server/pdf/patch-sheet';
import { bigPatch } from '../../tests/helpers/big-patch';

import { bench, type BenchLine, type BenchModule } from './harness';

const TARGET_MS = { 'pdf-patch-2k': 3000, 'pdf-labels-500': 3000 } as const;

const title = {
	sheet: 'Patch sheet',
	project: 'Bench rig',
	revision: 'Revision 1',
	printed: new Date(0).toISOString(),
	signoff: 'none'
};

export const pdf: BenchModule = {
	name: 'pdf',
	benches: ['pdf-patch-2k', 'pdf-labels-500'],
	async run(): Promise<BenchLine[]> {
		const big = bigPatch(2000);
		const labels = bigPatch(500);
		const patchMs = (await bench('pdf-patch-2k', () => renderPatchSheet(big, title, 'a4'), { runs: 5, warmup: 2 }))
			.median;
		const labelMs = (
			await bench(
				'pdf-labels-500',
				() =>
					renderLabelSheet(
						labels,
						{ ...title, sheet: 'Labels' },
						{ paper: 'a4', baseUrl: 'https://patchwright.example', projectId: 1 }
					),
				{ runs: 5, warmup: 2 }
			)
		).median;
		return [
			{ name: 'pdf-patch-2k', value: Math.round(patchMs), unit: 'ms', ratio: patchMs / TARGET_MS['pdf-patch-2k'] },
			{ name: 'pdf-labels-500', value: Math.round(labelMs), unit: 'ms', ratio: labelMs / TARGET_MS['pdf-labels-500'] }
		];
	}
};
