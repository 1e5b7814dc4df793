import { describe, expect, it } from 'vitest';
import { count } from '../../src/lib/format';

// English number agreement (common practice): the pages read "1 error", "14 fixtures", "0 errors",
// not "1 error(s)".
describe('count', () => {
	it('takes the singular for one and the plural otherwise', () => {
		expect(count(1, 'fixture')).toBe('1 fixture');
		expect(count(14, 'fixture')).toBe('14 fixtures');
		expect(count(0, 'error')).toBe('0 errors');
		expect(count(2, 'overlapping slot')).toBe('2 overlapping slots');
	});
	it('takes an irregular plural when given one', () => {
		expect(count(3, 'bay', 'bays')).toBe('3 bays');
		expect(count(2, 'person', 'people')).toBe('2 people');
	});
});
