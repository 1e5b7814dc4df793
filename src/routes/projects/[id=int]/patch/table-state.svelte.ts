import { SvelteSet } from 'svelte/reactivity';

// The patch table's page state as rune classes, so the rules are tested without a browser
// (tests/unit/patch-table/state.test.ts). The page wires them to the DOM and the API.

/** Which fixtures are chosen. Kept by fixture id, so sorting, filtering and saves leave it alone. */
export class Selection {
	readonly ids = new SvelteSet<number>();
	/** where a Shift-click range starts */
	anchor = $state<number | null>(null);

	get count(): number {
		return this.ids.size;
	}
	get list(): number[] {
		return [...this.ids];
	}
	has(id: number): boolean {
		return this.ids.has(id);
	}
	toggle(id: number): void {
		if (this.ids.has(id)) this.ids.delete(id);
		else this.ids.add(id);
		this.anchor = id;
	}
	/** Shift-click: everything between the anchor and `id` in the order shown takes `id`'s new state. */
	extendTo(order: readonly number[], id: number): void {
		const from = this.anchor === null ? -1 : order.indexOf(this.anchor);
		const to = order.indexOf(id);
		if (from < 0 || to < 0) return this.toggle(id);
		const on = !this.ids.has(id);
		const [a, b] = from < to ? [from, to] : [to, from];
		for (let i = a; i <= b; i++) {
			if (on) this.ids.add(order[i]);
			else this.ids.delete(order[i]);
		}
		this.anchor = id;
	}
	/** The header box: all shown on, or (when all are on already) all shown off. */
	toggleAll(shown: readonly number[]): void {
		const allOn = shown.length > 0 && shown.every((id) => this.ids.has(id));
		for (const id of shown) {
			if (allOn) this.ids.delete(id);
			else this.ids.add(id);
		}
	}
	allOf(shown: readonly number[]): boolean {
		return shown.length > 0 && shown.every((id) => this.ids.has(id));
	}
	clear(): void {
		this.ids.clear();
		this.anchor = null;
	}
	/** After a delete or someone else's change: drop ids that no longer exist, keep the rest. */
	keepOnly(existing: ReadonlySet<number>): void {
		for (const id of [...this.ids]) if (!existing.has(id)) this.ids.delete(id);
		if (this.anchor !== null && !existing.has(this.anchor)) this.anchor = null;
	}
}

/**
 * The grid's one tab stop (roving focus, WAI-ARIA APG "Grid"): a row index into the rows shown
 * (-1 is the header row) and a column index. The fixture id of the focused row is kept too, so
 * when sorting, filtering or a live update moves that fixture, focus follows the fixture.
 */
export class GridFocus {
	row = $state(0);
	col = $state(1);
	fixtureId = $state<number | null>(null);

	constructor(
		private rowCount: () => number,
		private colCount: () => number
	) {}

	/** Sets and clamps the position; answers the row index to scroll into view. */
	to(row: number, col: number, idAt: (row: number) => number | null): number {
		const rows = this.rowCount();
		this.row = Math.max(-1, Math.min(rows - 1, row));
		this.col = Math.max(0, Math.min(this.colCount() - 1, col));
		this.fixtureId = this.row >= 0 ? idAt(this.row) : null;
		return this.row;
	}
	move(dRow: number, dCol: number, idAt: (row: number) => number | null): number {
		return this.to(this.row + dRow, this.col + dCol, idAt);
	}
	/** The rows shown changed: find the focused fixture again (or stay in range). */
	follow(indexOf: (fixtureId: number) => number, idAt: (row: number) => number | null): void {
		if (this.fixtureId !== null) {
			const i = indexOf(this.fixtureId);
			if (i >= 0) {
				this.row = i;
				return;
			}
		}
		this.to(this.row, this.col, idAt);
	}
}

export interface TimerApi {
	set(fn: () => void, ms: number): unknown;
	clear(handle: unknown): void;
}
const realTimers: TimerApi = {
	set: (fn, ms) => setTimeout(fn, ms),
	clear: (h) => clearTimeout(h as ReturnType<typeof setTimeout>)
};

/**
 * Delete with undo: rows disappear at once, one DELETE for all of them goes out after a delay
 * unless Undo is pressed, so nothing is lost by a slip. A second delete sends the first at once.
 * `detach` is the answer to "set their followers to manual", asked before anything starts.
 */
export class PendingDelete {
	ids = $state.raw<number[]>([]);
	detach = $state(false);
	/** sent and not yet answered: still hidden, no longer undoable */
	sending = $state.raw<number[]>([]);
	private handle: unknown = null;

	constructor(
		private send: (ids: number[], detach: boolean) => Promise<void>,
		readonly delayMs = 6000,
		private timers: TimerApi = realTimers
	) {}

	get active(): boolean {
		return this.ids.length > 0;
	}
	get hidden(): ReadonlySet<number> {
		// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
		return new Set([...this.ids, ...this.sending]);
	}
	async start(ids: number[], detach = false): Promise<void> {
		if (!ids.length) return;
		const earlier = this.active ? this.flush() : Promise.resolve();
		this.ids = [...ids];
		this.detach = detach;
		this.handle = this.timers.set(() => void this.flush(), this.delayMs);
		await earlier;
	}
	undo(): number[] {
		const ids = this.ids;
		if (this.handle !== null) this.timers.clear(this.handle);
		this.handle = null;
		this.ids = [];
		return ids;
	}
	/** Sends now (Delete now, leaving the page, or a second delete). */
	async flush(): Promise<void> {
		const detach = this.detach;
		const ids = this.undo();
		if (!ids.length) return;
		this.sending = [...this.sending, ...ids];
		try {
			await this.send(ids, detach);
		} finally {
			// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
			const done = new Set(ids);
			this.sending = this.sending.filter((id) => !done.has(id));
		}
	}
}

export interface FollowLink {
	id: number;
	number: number;
	label: string;
	leaderId: number | null;
}

/** Fixtures that follow one of `ids` and are not being deleted with it: the delete must ask about them. */
export function followersOutside(fixtures: readonly FollowLink[], ids: readonly number[]): FollowLink[] {
	// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
	const chosen = new Set(ids);
	return fixtures.filter((f) => f.leaderId !== null && chosen.has(f.leaderId) && !chosen.has(f.id));
}
