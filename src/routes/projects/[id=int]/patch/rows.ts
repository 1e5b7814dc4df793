import {
	columnFilteringFeature,
	columnVisibilityFeature,
	createColumnHelper,
	createFilteredRowModel,
	createSortedRowModel,
	globalFilteringFeature,
	rowSortingFeature,
	sortFn_alphanumeric,
	sortFn_basic,
	tableFeatures,
	type Row
} from '@tanstack/svelte-table';
import type { Conflict } from '$lib/patch';
import {
	conflictsByFixture,
	controlText,
	lookups,
	slotsText,
	swatchOf,
	typeModeText,
	type PatchFixtureView
} from '$lib/patch-view';
import type { PatchData } from '$lib/shapes';

// The patch table's row model: one flat, precomputed view per fixture so
// sorting and filtering 20,000 rows compares plain values.

export interface RowView {
	id: string;
	f: PatchFixtureView;
	number: number;
	label: string;
	typeMode: string;
	control: string;
	/** universe number for sorting/filtering; null when not on DMX */
	universe: number | null;
	address: number | null;
	slots: string;
	position: string;
	group: string;
	state: string;
	swatch: string | null;
	conflicts: Conflict[];
	haystack: string;
}

const SEVERITY_RANK: Record<string, number> = { error: 3, warning: 2, info: 1 };

/** Conflicts that need fixing: a link group (info) is an intended shared address, not a problem. */
export function problemsOf(list: readonly Conflict[]): Conflict[] {
	return list.filter((c) => c.severity !== 'info');
}

/** The worst problem on a row; info alone is no problem, so it answers null. */
export function worstSeverity(list: readonly Conflict[]): 'error' | 'warning' | null {
	let worst: 'error' | 'warning' | null = null;
	for (const c of list) {
		if (c.severity === 'info') continue;
		if (!worst || SEVERITY_RANK[c.severity] > SEVERITY_RANK[worst]) worst = c.severity;
	}
	return worst;
}

export function buildRows(p: PatchData, hidden: ReadonlySet<number>): RowView[] {
	const l = lookups(p);
	const byFixture = conflictsByFixture(p.conflicts);
	const rows: RowView[] = [];
	for (const f of followersUnderLeaders(p.fixtures)) {
		if (hidden.has(f.id)) continue;
		const c = f.control;
		const uId = c.kind === 'dmx' || c.kind === 'dmx-map' ? c.universeId : null;
		const universe = uId != null ? (l.universes.get(uId)?.number ?? null) : null;
		const control = controlText(f, l);
		const typeMode = typeModeText(f, l);
		const slots = slotsText(f.slots);
		rows.push({
			id: String(f.id),
			f,
			number: f.number,
			label: f.label,
			typeMode,
			control,
			universe,
			address: c.kind === 'dmx' ? c.address : (f.slots[0]?.start ?? null),
			slots,
			position: f.position,
			group: f.group,
			state: f.state,
			swatch: swatchOf(f),
			conflicts: byFixture.get(f.id) ?? [],
			haystack:
				`${f.number} ${f.label} ${typeMode} ${control} ${f.position} ${f.group} ${f.linkGroup ?? ''}`.toLowerCase()
		});
	}
	return rows;
}

export const features = tableFeatures({
	rowSortingFeature,
	sortedRowModel: createSortedRowModel(),
	sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic },
	columnFilteringFeature,
	globalFilteringFeature,
	filteredRowModel: createFilteredRowModel(),
	columnVisibilityFeature
});

type R = Row<typeof features, RowView>;
const helper = createColumnHelper<typeof features, RowView>();

export const columns = helper.columns([
	helper.display({ id: 'select', header: 'Select', enableSorting: false, enableHiding: false }),
	helper.accessor('number', { header: '#', sortFn: 'basic', enableHiding: false }),
	helper.accessor('label', { header: 'Label', sortFn: 'alphanumeric' }),
	helper.accessor('typeMode', { header: 'Type · mode', sortFn: 'alphanumeric' }),
	// Sort by universe then address, not by the text "10.1" < "2.1".
	helper.accessor((r) => (r.universe ?? 1e6) * 1000 + (r.address ?? 999), {
		id: 'control',
		header: 'Control',
		sortFn: 'basic',
		filterFn: (row: R, _id: string, value: string) =>
			value === 'none' ? row.original.universe === null : row.original.universe === Number(value)
	}),
	helper.accessor('slots', { header: 'Slots', enableSorting: false }),
	helper.accessor('position', { header: 'Position', sortFn: 'alphanumeric' }),
	helper.accessor('group', { header: 'Group', sortFn: 'alphanumeric' }),
	helper.accessor('state', {
		header: 'State',
		sortFn: 'alphanumeric',
		filterFn: (row: R, _id: string, value: string) => row.original.state === value
	}),
	helper.accessor((r) => r.swatch ?? '', { id: 'colour', header: 'Look', enableSorting: false }),
	helper.accessor((r) => problemsOf(r.conflicts).length, {
		id: 'conflicts',
		header: 'Conflicts',
		sortFn: 'basic',
		filterFn: (row: R, _id: string, value: boolean) => !value || problemsOf(row.original.conflicts).length > 0
	})
]);

/** Grid track per column: dense on a laptop. */
export const WIDTHS: Record<string, string> = {
	select: '2.5rem',
	number: '4rem',
	label: 'minmax(7rem, 1fr)',
	typeMode: 'minmax(14rem, 2fr)',
	control: 'minmax(7rem, 0.9fr)',
	slots: '6.5rem',
	position: 'minmax(5rem, 0.7fr)',
	group: 'minmax(4rem, 0.5fr)',
	state: '6.5rem',
	colour: '3rem',
	conflicts: 'minmax(9rem, 1.2fr)'
};

/** A column with nothing in any row takes only its header's width. */
const EMPTY_WIDTHS: Record<string, string> = {
	slots: '3.5rem',
	position: '5.5rem',
	group: '4.5rem',
	conflicts: '6.5rem'
};
const EMPTY: Record<string, (r: RowView) => boolean> = {
	slots: (r) => r.slots === '',
	position: (r) => r.position === '',
	group: (r) => r.group === '',
	conflicts: (r) => r.conflicts.length === 0
};

/**
 * The grid's column template for these rows: every row is its own grid, so tracks cannot size to
 * content; instead the Type · mode track is at least as wide as its longest text (the bit depth at
 * the end is what tells modes apart), and a column empty on every row shrinks to its header.
 */
export function templateFor(columnIds: readonly string[], rows: readonly RowView[]): string {
	let longest = 0;
	for (const r of rows) if (r.typeMode.length > longest) longest = r.typeMode.length;
	const empty = new Set(Object.keys(EMPTY).filter((id) => rows.every(EMPTY[id])));
	return columnIds
		.map((id) => {
			if (empty.has(id)) return EMPTY_WIDTHS[id];
			// rem, not em: the header row's type is smaller than the rows', and both must get one track.
			// ~0.53rem a character of IBM Plex Sans at the rows' 14 px, plus the cell's padding; at most 30rem
			if (id === 'typeMode') return `minmax(min(30rem, max(14rem, ${(longest * 0.53).toFixed(1)}rem + 1rem)), 2fr)`;
			return WIDTHS[id] ?? '1fr';
		})
		.join(' ');
}

/** Columns a programmer can change inline. */
export const EDITABLE = new Set(['label', 'typeMode', 'control']);

export function globalFilterFn(row: R, _id: string, value: string): boolean {
	return row.original.haystack.includes(String(value).toLowerCase());
}

/**
 * Fixture order with each follower right under its leader (DESIGN.md: a follower "is listed under
 * its leader"); everything else keeps the API's fixture-number order. A follower whose leader is
 * missing, or itself a follower, stays where it is.
 */
export function followersUnderLeaders<T extends { id: number; control: PatchFixtureView['control'] }>(
	list: readonly T[]
): T[] {
	const byId = new Map(list.map((f) => [f.id, f]));
	const under = new Map<number, T[]>();
	for (const f of list)
		// only under a leader that leads: a cycle (A follows B follows A) keeps number order
		if (
			f.control.kind === 'follow' &&
			byId.get(f.control.leaderId)?.control.kind !== 'follow' &&
			byId.has(f.control.leaderId)
		) {
			const l = under.get(f.control.leaderId);
			if (l) l.push(f);
			else under.set(f.control.leaderId, [f]);
		}
	if (!under.size) return list as T[];
	const out: T[] = [];
	for (const f of list) {
		if (f.control.kind === 'follow' && under.get(f.control.leaderId)?.includes(f)) continue;
		out.push(f);
		for (const x of under.get(f.id) ?? []) out.push(x);
	}
	return out;
}
