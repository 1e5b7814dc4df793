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

// Sort key = (universe · 1024 + start) · 2^22 + run: stays an exact integer below 2^53.
const RUN_BITS = 4194304;
const MAX_UNIVERSES = 2 ** 19;

/**
 * One sort-and-sweep over all runs of all universes: O(n log n + overlaps). Runs are sorted by
 * (universe, start); an active list holds runs still open at the current start, so each run is
 * compared only with runs it actually intersects. Claims whose first runs share a start and that
 * `sameLayout` accepts are stacked (union-find) instead of reported as overlaps.
 */
export function sweep(claims: readonly Claim[], sameLayout: (a: number, b: number) => boolean): SweepResult {
	let n = 0;
	for (const c of claims) n += c.runs.length;
	if (n >= RUN_BITS || claims.length >= RUN_BITS) throw new RangeError(`too many slot runs to sweep (${n})`);
	const runStart = new Int32Array(n);
	const runEnd = new Int32Array(n);
	const runClaim = new Int32Array(n);
	const runFirst = new Uint8Array(n);
	const keys = new Float64Array(n);
	let r = 0;
	for (let ci = 0; ci < claims.length; ci++) {
		const c = claims[ci];
		if (c.universe >= MAX_UNIVERSES) throw new RangeError('too many universes to sweep');
		for (let k = 0; k < c.runs.length; k++) {
			const run = c.runs[k];
			runStart[r] = run.start;
			runEnd[r] = run.end;
			runClaim[r] = ci;
			runFirst[r] = k === 0 ? 1 : 0;
			keys[r] = (c.universe * 1024 + run.start) * RUN_BITS + r;
			r++;
		}
	}
	// A typed-array sort compares numbers natively, without a comparator call per comparison.
	keys.sort();

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
		const i = keys[k] % RUN_BITS;
		const ci = runClaim[i];
		const s = runStart[i];
		const e = runEnd[i];
		const u = claims[ci].universe;
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
