import type { FixtureShape, PatchData } from '$lib/shapes';

// The browser end of the live feed (src/lib/server/live.ts): one EventSource per open page.
// Changes arrive in counter order; a jump in the counter, a reconnect to a server that moved on
// or restarted, or a change too wide to send as rows calls onGap, and the page refetches.

export interface LiveEvent {
	counter: number;
	fixtures: PatchData['fixtures'];
	deleted: number[];
	conflicts: PatchData['conflicts'];
	by: string;
	refetch: boolean;
}

export interface LiveHandlers {
	onChange: (e: LiveEvent) => void;
	onGap: () => void;
}

export class LiveFeed {
	connected = $state(false);
	counter: number | null = null;
	private epoch: string | null = null;
	private source: EventSource | null = null;

	constructor(
		private url: () => string,
		private handlers: LiveHandlers
	) {}

	start(): void {
		if (typeof EventSource === 'undefined' || this.source) return;
		const source = new EventSource(this.url());
		this.source = source;
		source.addEventListener('hello', (m) => {
			const hello = JSON.parse((m as MessageEvent<string>).data) as { counter: number; epoch: string };
			const missed = this.counter !== null && (hello.counter !== this.counter || hello.epoch !== this.epoch);
			this.counter = hello.counter;
			this.epoch = hello.epoch;
			this.connected = true;
			if (missed) this.handlers.onGap();
		});
		source.addEventListener('change', (m) => this.receive(JSON.parse((m as MessageEvent<string>).data) as LiveEvent));
		source.addEventListener('error', () => (this.connected = false));
	}

	/** In counter order, or a gap. */
	receive(e: LiveEvent): void {
		const expected = this.counter === null ? e.counter : this.counter + 1;
		this.counter = e.counter;
		if (e.counter !== expected || e.refetch) this.handlers.onGap();
		else this.handlers.onChange(e);
	}

	stop(): void {
		this.source?.close();
		this.source = null;
		this.connected = false;
	}
}

/** The patch with a live change applied in place: rows replaced or added in number order, deleted ones gone. */
export function applyLive(patch: PatchData, e: Pick<LiveEvent, 'fixtures' | 'deleted' | 'conflicts'>): PatchData {
	// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
	const gone = new Set(e.deleted);
	// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
	const incoming = new Map(e.fixtures.map((f) => [f.id, f]));
	const kept = patch.fixtures.filter((f) => !gone.has(f.id)).map((f) => incoming.get(f.id) ?? f);
	// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
	const known = new Set(patch.fixtures.map((f) => f.id));
	const added = e.fixtures.filter((f) => !known.has(f.id) && !gone.has(f.id));
	const fixtures = added.length ? [...kept, ...added].sort((a, b) => a.number - b.number) : kept;
	const changedNumbers = e.fixtures.some((f) => known.has(f.id));
	return {
		...patch,
		fixtures: changedNumbers && !added.length ? [...fixtures].sort((a, b) => a.number - b.number) : fixtures,
		conflicts: e.conflicts
	};
}

/**
 * A write's own answer applied at once: the API answers rows without their computed slots, so a
 * row keeps the slots it had (a new one has none) until the live event brings them; if that
 * event came first, its slots stay.
 */
export function applyAnswer(patch: PatchData, changed: readonly FixtureShape[]): PatchData {
	// eslint-disable-next-line svelte/prefer-svelte-reactivity -- a throwaway lookup, never mutated
	const had = new Map(patch.fixtures.map((f) => [f.id, f]));
	const rows = changed.map((f) => {
		const old = had.get(f.id);
		return { ...f, slots: old?.slots ?? [], footprint: old?.footprint ?? null, breakSlots: old?.breakSlots };
	});
	return applyLive(patch, { fixtures: rows, deleted: [], conflicts: patch.conflicts });
}
