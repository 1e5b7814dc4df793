import { describe, expect, it } from 'vitest';
import { applyAnswer, applyLive, LiveFeed, type LiveEvent } from '../../../src/lib/client/live.svelte';
import type { PatchData } from '../../../src/lib/server/db/patch';

// Live changes in counter order (WHATWG HTML "Server-sent events" carry them); a gap refetches.

type Fx = PatchData['fixtures'][number];
const fx = (id: number, number: number, label = `F${number}`) => ({ id, number, label }) as unknown as Fx;
const patchOf = (fixtures: Fx[]) => ({ fixtures, conflicts: [] }) as unknown as PatchData;
const event = (counter: number, extra: Partial<LiveEvent> = {}): LiveEvent => ({
	counter,
	fixtures: [],
	deleted: [],
	conflicts: [],
	by: 'u',
	refetch: false,
	...extra
});

describe('applyLive', () => {
	it('replaces changed rows in place, adds new ones in number order, drops deleted ones', () => {
		const before = patchOf([fx(1, 101), fx(2, 102), fx(3, 103)]);
		const conflicts = [{ kind: 'overlap' }] as unknown as PatchData['conflicts'];
		const after = applyLive(before, { fixtures: [fx(2, 102, 'NEW'), fx(9, 101.5 as number)], deleted: [3], conflicts });
		expect(after.fixtures.map((f) => [f.id, f.label])).toEqual([
			[1, 'F101'],
			[9, 'F101.5'],
			[2, 'NEW']
		]);
		expect(after.conflicts).toBe(conflicts);
		expect(before.fixtures).toHaveLength(3); // the old patch is left alone
	});
	it('a renumbered row moves to its place', () => {
		const after = applyLive(patchOf([fx(1, 101), fx(2, 102)]), { fixtures: [fx(1, 200)], deleted: [], conflicts: [] });
		expect(after.fixtures.map((f) => f.id)).toEqual([2, 1]);
	});
});

describe('applyAnswer', () => {
	it('keeps the computed slots a changed row had, gives a new row none, and keeps the conflicts', () => {
		const slots = [{ start: 1, end: 6 }];
		const before = patchOf([{ ...fx(1, 101), slots, footprint: 6 } as Fx]);
		const after = applyAnswer(before, [{ ...fx(1, 101, 'RELABELLED') } as Fx, { ...fx(5, 150, 'COPY') } as Fx]);
		expect(after.fixtures.map((f) => [f.id, f.label, f.slots])).toEqual([
			[1, 'RELABELLED', slots],
			[5, 'COPY', []]
		]);
		expect(after.fixtures[0].footprint).toBe(6);
		expect(after.conflicts).toBe(before.conflicts);
	});
});

describe('LiveFeed.receive', () => {
	it('applies changes in order and refetches on a gap or a wide change', () => {
		const log: string[] = [];
		const feed = new LiveFeed(() => '/x', {
			onChange: (e) => log.push(`change ${e.counter}`),
			onGap: () => log.push('gap')
		});
		feed.counter = 4;
		feed.receive(event(5));
		feed.receive(event(7));
		feed.receive(event(8, { refetch: true }));
		feed.receive(event(9));
		expect(log).toEqual(['change 5', 'gap', 'gap', 'change 9']);
	});
});
