// Shared bench harness: warm up, time several runs, report the median, print one line a result.

export interface BenchLine {
	name: string;
	value: number;
	unit: string;
	/** Value against its target or baseline; ≤ 1 (or the bench's stated bound) is good. */
	ratio: number;
}

export interface BenchModule {
	name: string;
	/** Names of the lines this module prints, so a filter can pick it without running it. */
	benches?: readonly string[];
	/** Why the module cannot run here (e.g. no built server), or null to run it. */
	skip?(): Promise<string | null>;
	run(options?: { filter?: string }): Promise<BenchLine[]>;
}

export interface BenchOptions {
	runs?: number;
	warmup?: number;
}

export interface BenchResult {
	name: string;
	/** Median wall time of one run, ms. */
	median: number;
	samples: number[];
}

function median(xs: readonly number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const mid = s.length >> 1;
	return s.length % 2 === 1 ? (s[mid] as number) : ((s[mid - 1] as number) + (s[mid] as number)) / 2;
}

/** Time `fn`: `warmup` untimed runs (JIT, caches), then the median of `runs` timed ones. */
export async function bench(
	name: string,
	fn: () => unknown,
	{ runs = 15, warmup = 5 }: BenchOptions = {}
): Promise<BenchResult> {
	for (let i = 0; i < warmup; i++) await fn();
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t = performance.now();
		await fn();
		samples.push(performance.now() - t);
	}
	return { name, median: median(samples), samples };
}

/**
 * Time a subject against its baseline, alternating them run by run, so a busy
 * machine slows both alike and the ratio stays meaningful.
 */
export async function benchAgainst(
	subject: () => unknown,
	baseline: () => unknown,
	{ runs = 21, warmup = 10 }: BenchOptions = {}
): Promise<{ subject: number; baseline: number; ratio: number }> {
	for (let i = 0; i < warmup; i++) {
		await baseline();
		await subject();
	}
	const a: number[] = [];
	const b: number[] = [];
	for (let i = 0; i < runs; i++) {
		let t = performance.now();
		await baseline();
		b.push(performance.now() - t);
		t = performance.now();
		await subject();
		a.push(performance.now() - t);
	}
	const subjectMedian = median(a);
	const baselineMedian = median(b);
	return { subject: subjectMedian, baseline: baselineMedian, ratio: subjectMedian / baselineMedian };
}

export function formatLine(line: BenchLine): string {
	return `BENCH ${line.name} ${line.value.toFixed(2)} ${line.unit} ratio=${line.ratio.toFixed(2)}`;
}

/** A module is selected by no filter, its own name, or the name of a line it prints. */
export function selects(filter: string | undefined, module: BenchModule): boolean {
	return filter === undefined || module.name.includes(filter) || (module.benches ?? []).some((b) => b.includes(filter));
}

/** Small seeded PRNG (mulberry32) so every run benches the same data. */
export function seeded(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}
