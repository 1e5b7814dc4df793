import { describe, expect, it } from 'vitest';
import { bigPatch } from '../../helpers/big-patch';
import { decodeTableFeed, encodeTableFeed } from '../../../src/lib/table-feed';
import type { PatchData } from '../../../src/lib/shapes';

// The patch table's lean first load (issue 18): what the page decodes is the patch the API
// answers, less the notes the table does not show, and 20,000 fixtures stay under 2 MB.

const withoutNotes = (p: PatchData): PatchData => ({ ...p, fixtures: p.fixtures.map((f) => ({ ...f, notes: '' })) });

describe('table feed', () => {
	it('round-trips every control kind, breaks, feeds, links and empty values', () => {
		const p = bigPatch(300);
		const f = p.fixtures;
		f[1] = {
			...f[1],
			control: { kind: 'dmx-map', universeId: 1, addresses: { intensity: 300, hue: 12 } },
			slots: [
				{ start: 12, end: 13 },
				{ start: 300, end: 301 }
			]
		};
		f[2] = {
			...f[2],
			control: { kind: 'rc', receiverId: 4, channels: { intensity: 1, hue: 2 } },
			slots: [],
			footprint: null
		};
		f[3] = { ...f[3], control: { kind: 'follow', leaderId: 1 }, slots: [], linkGroup: 'bow', watts: null };
		f[4] = { ...f[4], control: { kind: 'manual' }, slots: [], footprint: null, feed: { kind: 'none' } };
		f[5] = {
			...f[5],
			control: { kind: 'dmx', universeId: 2, address: 9, breaks: [{ dmxBreak: 2, universeId: 3, address: 100 }] },
			breakSlots: [
				{ dmxBreak: 2, universeId: 3, slots: [{ start: 100, end: 103 }] }
			] as unknown as PatchData['fixtures'][number]['breakSlots'],
			feed: { kind: 'battery', packTypeId: 7 },
			label: 'ÜBER "quoted" \\ label',
			look: { hue: 30, saturation: 100, intensity: 50, cct: null }
		};
		// a fixture whose slots do not follow from its address (a legacy row): sent as they are
		f[6] = { ...f[6], slots: [{ start: 1, end: 2 }] };
		f[7] = { ...f[7], number: 5, id: 9000 }; // ids and numbers need not climb
		expect(decodeTableFeed(JSON.parse(JSON.stringify(encodeTableFeed(p))))).toEqual(withoutNotes(p));
	});

	it('an empty patch round-trips', () => {
		const p = bigPatch(0);
		expect(decodeTableFeed(encodeTableFeed(p))).toEqual(p);
	});

	it('20,000 fixtures stay under 2,000,000 bytes (issue 18), well under the full patch JSON', () => {
		const p = bigPatch(20_000);
		const lean = JSON.stringify(encodeTableFeed(p)).length;
		const full = JSON.stringify(p).length;
		expect(lean).toBeLessThan(2_000_000);
		expect(lean).toBeLessThan(full / 3);
	});
});
