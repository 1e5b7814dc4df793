import type { SlotRange } from './types';

/** One fixture's claimed slots in one universe, as disjoint runs sorted by start. */
export interface Claim {
	/** Index of the universe in sweep order; claims of different universes never meet. */
	universe: number;
	runs: readonly SlotRange[];
}

export interface SweepResult {
	/** Pairs [a, b] (claim indices, a < b) with the exact slots both claim. */
	overlaps: { a: number; b: number; slots: number[] }[];
	/** Sets of claim indices (≥ 2, ascending) that `sameLayout` matched: same start, same everything. */
	stacks: number[][];
}

// Comparison sort key = (universe · 1024 + start) · 2^22 + run: an exact integer below 2^53.
const RUN_BITS = 4194304;
const MAX_UNIVERSES = 2 ** 19;
// Starts are 1–512, so (universe, start) has few distinct values: above this many buckets per
// run, a comparison sort beats counting.
const BUCKETS_PER_RUN = 8;

/**
 * One sort-and-sweep over all runs of all universes: O(n log n + overlaps) (a counting sort on
 * (universe, start) makes the sort linear when universes are few). Runs are sorted by
 * (universe, start, input order); an active list holds runs still open at the current start, so
 * each run is compared only with runs it actually intersects. Claims whose first runs share a
 * start and that `sameLayout` accepts are stacked (union-find) instead of reported as overlaps.
 */
export function sweep(
	claims: readonly Claim[],
	sameLayout: (a: number, b: number) => boolean,
	{ comparisonSort = false }: { comparisonSort?: boolean } = {}
): SweepResult {
	let n = 0;
	let universes = 0;
	for (const c of claims) {
		n += c.runs.length;
		if (c.universe >= universes) universes = c.universe + 1;
	}
	if (n >= RUN_BITS || claims.length >= RUN_BITS) throw new RangeError(`too many slot runs to sweep (${n})`);
	if (universes > MAX_UNIVERSES) throw new RangeError('too many universes to sweep');
	const runStart = new Int32Array(n);
	const runEnd = new Int32Array(n);
	const runClaim = new Int32Array(n);
	const runUniverse = new Int32Array(n);
	const runFirst = new Uint8Array(n);
	let r = 0;
	for (let ci = 0; ci < claims.length; ci++) {
		const c = claims[ci];
		const runs = c.runs;
		for (let k = 0; k < runs.length; k++) {
			runStart[r] = runs[k].start;
			runEnd[r] = runs[k].end;
			runClaim[r] = ci;
			runUniverse[r] = c.universe;
			runFirst[r] = k === 0 ? 1 : 0;
			r++;
		}
	}

	const order = new Int32Array(n);
	const buckets = universes * 513;
	if (!comparisonSort && buckets <= BUCKETS_PER_RUN * n + 65536) {
		const next = new Int32Array(buckets + 1);
		for (let i = 0; i < n; i++) next[runUniverse[i] * 513 + runStart[i] + 1]++;
		for (let b = 1; b <= buckets; b++) next[b] += next[b - 1];
		for (let i = 0; i < n; i++) order[next[runUniverse[i] * 513 + runStart[i]]++] = i;
	} else {
		const keys = new Float64Array(n);
		for (let i = 0; i < n; i++) keys[i] = (runUniverse[i] * 1024 + runStart[i]) * RUN_BITS + i;
		// A typed-array sort compares numbers natively, without a comparator call per comparison.
		keys.sort();
		for (let k = 0; k < n; k++) order[k] = keys[k] % RUN_BITS;
	}

	const parent = new Int32Array(claims.length);
	for (let i = 0; i < parent.length; i++) parent[i] = i;
	const find = (x: number): number => {
		while (parent[x] !== x) {
			parent[x] = parent[parent[x]];
			x = parent[x];
		}
		return x;
	};
	const stacked = new Uint8Array(claims.length);

	const pairSegments = new Map<number, number[]>();
	const pairOrder: number[] = [];
	const active: number[] = [];
	let activeLen = 0;
	let universe = -1;
	for (let k = 0; k < n; k++) {
		const i = order[k];
		const ci = runClaim[i];
		const s = runStart[i];
		const e = runEnd[i];
		const u = runUniverse[i];
		if (u !== universe) {
			universe = u;
			activeLen = 0;
		}
		let w = 0;
		for (let j = 0; j < activeLen; j++) {
			const a = active[j];
			if (runEnd[a] >= s) active[w++] = a;
		}
		activeLen = w;
		for (let j = 0; j < activeLen; j++) {
			const a = active[j];
			const ca = runClaim[a];
			const ra = find(ca);
			const rb = find(ci);
			if (ra === rb) continue;
			if (runStart[a] === s && runFirst[a] === 1 && runFirst[i] === 1 && sameLayout(ca, ci)) {
				parent[ra > rb ? ra : rb] = ra > rb ? rb : ra;
				stacked[ca] = 1;
				stacked[ci] = 1;
				continue;
			}
			const lo = ca < ci ? ca : ci;
			const hi = ca < ci ? ci : ca;
			const key = lo * RUN_BITS + hi;
			let seg = pairSegments.get(key);
			if (seg === undefined) {
				seg = [];
				pairSegments.set(key, seg);
				pairOrder.push(key);
			}
			seg.push(s, runEnd[a] < e ? runEnd[a] : e);
		}
		active[activeLen++] = i;
	}

	const overlaps: SweepResult['overlaps'] = [];
	for (const key of pairOrder) {
		const seg = pairSegments.get(key) ?? [];
		const slots: number[] = [];
		for (let j = 0; j < seg.length; j += 2) for (let s = seg[j]; s <= seg[j + 1]; s++) slots.push(s);
		const a = Math.floor(key / RUN_BITS);
		overlaps.push({ a, b: key - a * RUN_BITS, slots });
	}

	const byRoot = new Map<number, number[]>();
	for (let ci = 0; ci < claims.length; ci++) {
		if (stacked[ci] === 0) continue;
		const root = find(ci);
		const list = byRoot.get(root);
		if (list === undefined) byRoot.set(root, [ci]);
		else list.push(ci);
	}
	return { overlaps, stacks: [...byRoot.values()] };
}
