import { describe, expect, it } from 'vitest';
import { assignRc } from '../../../src/lib/patch/index';
import { summarizeAssign } from '../../../src/routes/projects/[id=int]/radio/assign-summary';

// Issue 18: a link group shares its channels, so channels ≠ parameters. Four units linked in one
// group with 3 parameters each use 3 channels for 12 parameters (rc.ts: "a link group takes its
// channels once"); the old report counted assignments and said "Assigned 12 channel(s)".
const fx = (id: number, group: string | null, channels: Record<string, number> = {}) => ({
	id,
	number: id,
	label: `RC ${id}`,
	linkGroup: group,
	parameters: ['intensity', 'cct', 'tint'],
	channels,
	control: { kind: 'rc', channels }
});

describe('auto-assign report', () => {
	it('counts distinct channels apart from parameters', () => {
		const list = [fx(1, 'deck'), fx(2, 'deck'), fx(3, 'deck'), fx(4, 'deck'), fx(5, null)];
		const result = assignRc({ receiver: { id: 9, protocol: 'sbus' }, fixtures: list });
		const s = summarizeAssign(9, list, result, true);
		expect(s.parameters).toBe(15);
		expect(s.channels).toBe(6);
		expect(s.fixtures).toBe(5);
	});

	it('keeps a hand-set channel and counts it as kept', () => {
		const list = [fx(1, null, { intensity: 10, cct: 11, tint: 12 }), fx(2, null)];
		const result = assignRc({ receiver: { id: 9, protocol: 'sbus' }, fixtures: list, keepExisting: true });
		const s = summarizeAssign(9, list, result, true);
		expect(s.rows.filter((r) => r.number === 1).map((r) => r.to)).toEqual([10, 11, 12]);
		expect(s.kept).toBe(3);
		expect(s.changed).toBe(3);
	});
});
