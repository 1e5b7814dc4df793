import { createHash } from 'node:crypto';
import { LRUCache } from 'lru-cache';
import type { CsvPlan } from './csv';

// A CSV import previews, then applies the same file. The preview's checked plan is kept here (in the
// worker thread that made it, for its own database connection), so that apply can write it without
// parsing and checking the file again — but only for the same bytes, project and user, and only while
// nothing at all has been committed to the database since the preview (csv.ts applyCsvPlan compares
// the state). Anything else, or an apply that lands on another worker thread, runs the whole import.

interface Kept {
	plan: CsvPlan;
	state: string;
}

/** a few plans, bounded by their rows (a 20,000-row plan is some 10 MB), and not kept long */
const kept = new LRUCache<string, Kept>({
	maxSize: 40_000,
	sizeCalculation: (k) => Math.max(1, k.plan.rows.length + k.plan.changes.length),
	ttl: 10 * 60_000
});

export function planKey(projectId: number, userId: string, bytes: Uint8Array): string {
	return `${projectId}\u0000${userId}\u0000${createHash('sha256').update(bytes).digest('base64url')}`;
}

export function keepPlan(key: string, plan: CsvPlan, state: string): void {
	kept.set(key, { plan, state });
}

/** The plan for this key, taken out: a plan is applied at most once. */
export function takePlan(key: string): Kept | undefined {
	const k = kept.get(key);
	if (k) kept.delete(key);
	return k;
}

/** for tests */
export function forgetPlans(): void {
	kept.clear();
}
