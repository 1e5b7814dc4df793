import { describe, expect, it } from 'vitest';
import { forgetPlans, keepPlan, planKey, takePlan } from '../../../src/lib/server/import/csv-plan';
import type { CsvPlan } from '../../../src/lib/server/import/csv';

// The kept preview plans of CSV imports (csv-plan.ts): found only by the same project, user and bytes,
// and given out once.

const bytes = new TextEncoder().encode('number,universe,address\n1,1,1\n');
const plan = { rows: [], changes: [] } as unknown as CsvPlan;

describe('kept CSV import plans', () => {
	it('are found only for the same project, user and bytes', () => {
		forgetPlans();
		keepPlan(planKey(1, 'ann', bytes), plan, 'state');
		expect(takePlan(planKey(2, 'ann', bytes))).toBeUndefined();
		expect(takePlan(planKey(1, 'bob', bytes))).toBeUndefined();
		expect(takePlan(planKey(1, 'ann', new TextEncoder().encode('number,universe,address\n1,1,2\n')))).toBeUndefined();
		expect(takePlan(planKey(1, 'ann', bytes))).toEqual({ plan, state: 'state' });
	});

	it('are given out once', () => {
		forgetPlans();
		keepPlan(planKey(1, 'ann', bytes), plan, 'state');
		expect(takePlan(planKey(1, 'ann', bytes))).toBeDefined();
		expect(takePlan(planKey(1, 'ann', bytes))).toBeUndefined();
	});
});
