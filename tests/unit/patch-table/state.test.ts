import { describe, expect, it } from 'vitest';
import {
	followersOutside,
	GridFocus,
	PendingDelete,
	Selection,
	type TimerApi
} from '../../../src/routes/projects/[id=int]/patch/table-state.svelte';

// The patch table's page state without a browser. Keyboard rules follow the WAI-ARIA Authoring
// Practices "Grid" pattern (one tab stop, arrows move, Space selects a row).

describe('Selection', () => {
	it('toggles by fixture id and keeps ids through a re-sort', () => {
		const s = new Selection();
		s.toggle(5);
		s.toggle(9);
		s.toggle(5);
		expect(s.list).toEqual([9]);
		expect(s.has(9)).toBe(true);
		expect(s.count).toBe(1);
	});

	it('Shift extends from the anchor in the order shown, both directions', () => {
		const s = new Selection();
		const order = [40, 10, 30, 20, 50];
		s.toggle(10);
		s.extendTo(order, 20);
		expect(new Set(s.list)).toEqual(new Set([10, 30, 20]));
		s.extendTo(order, 40); // 40 is off: the run from 20 back to 40 turns on
		expect(new Set(s.list)).toEqual(new Set([40, 10, 30, 20]));
	});

	it('the header box selects all shown, then clears them; others stay', () => {
		const s = new Selection();
		s.toggle(99);
		s.toggleAll([1, 2, 3]);
		expect(s.allOf([1, 2, 3])).toBe(true);
		s.toggleAll([1, 2, 3]);
		expect(s.list).toEqual([99]);
		expect(s.allOf([])).toBe(false);
	});

	it('keepOnly drops deleted fixtures and keeps the rest selected', () => {
		const s = new Selection();
		for (const id of [1, 2, 3]) s.toggle(id);
		s.keepOnly(new Set([1, 3, 4]));
		expect(s.list).toEqual([1, 3]);
		expect(s.anchor).toBe(3); // the last one toggled still exists
		s.keepOnly(new Set([1]));
		expect(s.anchor).toBeNull();
	});
});

describe('GridFocus', () => {
	const rows = [11, 12, 13, 14];
	const idAt = (i: number) => rows[i] ?? null;

	it('clamps to the grid; row -1 is the header', () => {
		const f = new GridFocus(
			() => rows.length,
			() => 5
		);
		f.to(10, 10, idAt);
		expect([f.row, f.col, f.fixtureId]).toEqual([3, 4, 14]);
		f.move(-9, -9, idAt);
		expect([f.row, f.col, f.fixtureId]).toEqual([-1, 0, null]);
	});

	it('follows the focused fixture when the rows shown are re-ordered', () => {
		let shown = [11, 12, 13, 14];
		const f = new GridFocus(
			() => shown.length,
			() => 5
		);
		f.to(2, 1, (i) => shown[i] ?? null);
		expect(f.fixtureId).toBe(13);
		shown = [14, 13, 12, 11];
		f.follow(
			(id) => shown.indexOf(id),
			(i) => shown[i] ?? null
		);
		expect(f.row).toBe(1);
		shown = [11];
		f.follow(
			(id) => shown.indexOf(id),
			(i) => shown[i] ?? null
		);
		expect([f.row, f.fixtureId]).toEqual([0, 11]);
	});
});

function fakeTimers() {
	const queue = new Map<number, () => void>();
	let next = 1;
	const api: TimerApi = {
		set: (fn) => {
			queue.set(next, fn);
			return next++;
		},
		clear: (h) => void queue.delete(h as number)
	};
	return { api, queue, fire: () => [...queue.entries()].forEach(([k, fn]) => (queue.delete(k), fn())) };
}

describe('PendingDelete', () => {
	it('hides at once, sends one request for all ids after the delay', async () => {
		const sent: [number[], boolean][] = [];
		const t = fakeTimers();
		const d = new PendingDelete(async (ids, detach) => void sent.push([ids, detach]), 6000, t.api);
		await d.start([1, 2, 3]);
		expect([...d.hidden]).toEqual([1, 2, 3]);
		expect(sent).toEqual([]);
		t.fire();
		await Promise.resolve();
		expect(sent).toEqual([[[1, 2, 3], false]]);
		expect(d.active).toBe(false);
	});

	it('Undo sends nothing and shows the rows again', async () => {
		const sent: number[][] = [];
		const t = fakeTimers();
		const d = new PendingDelete(async (ids) => void sent.push(ids), 6000, t.api);
		await d.start([4], true);
		expect(d.undo()).toEqual([4]);
		t.fire();
		expect(sent).toEqual([]);
		expect(d.hidden.size).toBe(0);
	});

	it('a second delete sends the first at once, with its own detach answer', async () => {
		const sent: [number[], boolean][] = [];
		const t = fakeTimers();
		const d = new PendingDelete(async (ids, detach) => void sent.push([ids, detach]), 6000, t.api);
		await d.start([1], true);
		await d.start([2]);
		expect(sent).toEqual([[[1], true]]);
		expect(d.ids).toEqual([2]);
		expect(t.queue.size).toBe(1);
	});

	it('rows stay hidden while the request is out, and come back if it fails', async () => {
		let fail!: (e: Error) => void;
		const d = new PendingDelete(() => new Promise<void>((_, reject) => (fail = reject)), 6000, fakeTimers().api);
		await d.start([7]);
		const sending = d.flush();
		expect([...d.hidden]).toEqual([7]);
		fail(new Error('refused'));
		await expect(sending).rejects.toThrow('refused');
		expect(d.hidden.size).toBe(0);
	});
});

describe('followersOutside', () => {
	const f = (id: number, leaderId: number | null) => ({ id, number: id + 100, label: `F${id}`, leaderId });
	it('names followers that are not deleted with their leader', () => {
		const all = [f(1, null), f(2, 1), f(3, 1), f(4, null), f(5, 4)];
		expect(followersOutside(all, [1, 2]).map((x) => x.id)).toEqual([3]);
		expect(followersOutside(all, [1, 2, 3])).toEqual([]);
		expect(followersOutside(all, [5]).map((x) => x.id)).toEqual([]);
	});
});
