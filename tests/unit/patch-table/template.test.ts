import { describe, expect, it } from 'vitest';
import { templateFor, WIDTHS, type RowView } from '../../../src/routes/projects/[id=int]/patch/rows';

// The patch table's column tracks (issue 18: the Type · mode column cut off the bit depth while
// empty columns took space).

const row = (over: Partial<RowView>): RowView =>
	({ typeMode: 'Maker Panel · HSIC 8-bit', slots: '1–8', position: '', group: '', conflicts: [], ...over }) as RowView;
const ids = ['select', 'number', 'typeMode', 'slots', 'position', 'group', 'conflicts'];

describe('templateFor', () => {
	it('makes the Type · mode track at least as wide as its longest text', () => {
		const long = 'Marrowlight Reed Tube 120 · HSIC 16-bit + FX'; // 44 characters
		const template = templateFor(ids, [row({}), row({ typeMode: long })]);
		// 44 × 0.53rem = 23.3rem (in rem, so the header row's smaller type gets the same track), within 14–30rem
		expect(template).toContain('minmax(min(30rem, max(14rem, 23.3rem + 1rem)), 2fr)');
	});

	it('shrinks columns empty on every row to their header, and keeps them when one row has a value', () => {
		const empty = templateFor(ids, [row({}), row({})]);
		expect(empty).toContain('5.5rem 4.5rem 6.5rem'); // position, group, conflicts
		expect(empty).not.toContain(WIDTHS.position);
		const filled = templateFor(ids, [
			row({}),
			row({ position: 'Dock', group: 'Deck', conflicts: [{}] as RowView['conflicts'] })
		]);
		expect(filled).toContain(`${WIDTHS.position} ${WIDTHS.group} ${WIDTHS.conflicts}`);
	});
});
