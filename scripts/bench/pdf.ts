// Printed sheets, rendered in-process through the same code the routes use:
// the patch sheet of a 2,000-fixture rig and 500 labels with QR codes.
import { renderLabelSheet } from '../../src/lib/server/pdf/label-sheet';
import { renderPatchSheet } from '../../src/lib/server/pdf/patch-sheet';
import { bigPatch } from '../../tests/helpers/big-patch';

// Same shape as BenchLine in ./harness (declared here so this module stands alone).
interface BenchLine {
	name: string;
	value: number;
	unit: string;
	ratio: number;
}

const TARGET_MS = { 'pdf-patch-2k': 3000, 'pdf-labels-500': 3000 } as const;

async function medianMs(fn: () => Promise<unknown>, runs = 5, warmup = 2): Promise<number> {
	for (let i = 0; i < warmup; i++) await fn();
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t = performance.now();
		await fn();
		samples.push(performance.now() - t);
	}
	samples.sort((a, b) => a - b);
	return samples[samples.length >> 1];
}

const title = { sheet: 'Patch sheet', project: 'Bench rig', revision: 'Revision 1', printed: new Date(0).toISOString(), signoff: 'none' };

export default {
	name: 'pdf',
	benches: ['pdf-patch-2k', 'pdf-labels-500'],
	async run(): Promise<BenchLine[]> {
		const big = bigPatch(2000);
		const labels = bigPatch(500);
		const patchMs = await medianMs(() => renderPatchSheet(big, title, 'a4'));
		const labelMs = await medianMs(() =>
			renderLabelSheet(labels, { ...title, sheet: 'Labels' }, { paper: 'a4', baseUrl: 'https://patchwright.example', projectId: 1 })
		);
		return [
			{ name: 'pdf-patch-2k', value: Math.round(patchMs), unit: 'ms', ratio: patchMs / TARGET_MS['pdf-patch-2k'] },
			{ name: 'pdf-labels-500', value: Math.round(labelMs), unit: 'ms', ratio: labelMs / TARGET_MS['pdf-labels-500'] }
		];
	}
};
