import type { FixtureControl } from '$lib/patch';
import type { RowView } from './rows';

// What one inline edit sends: only the field that changed, plus the version
// the row was read at (DESIGN.md: PATCH takes any subset plus `version`).

export interface Draft {
	rowId: string;
	col: string;
	label: string;
	modeId: number;
	universeId: number | null;
	address: string;
}

export function draftFor(r: RowView, col: string): Draft {
	const c = r.f.control;
	return {
		rowId: r.id,
		col,
		label: r.f.label,
		modeId: r.f.modeId,
		universeId: c.kind === 'dmx' || c.kind === 'dmx-map' ? c.universeId : null,
		address: c.kind === 'dmx' ? String(c.address) : ''
	};
}

export type EditBody = { label: string } | { modeId: number } | { control: FixtureControl };

/** The PATCH fields for a draft, or a message saying why it cannot be sent. */
export function bodyFor(d: Draft, r: RowView): EditBody | string {
	if (d.col === 'label') {
		const label = d.label.trim();
		return label ? { label } : 'A label cannot be empty.';
	}
	if (d.col === 'typeMode') return { modeId: d.modeId };
	if (d.universeId === null) return { control: { kind: 'manual' } };
	const address = Number(d.address);
	if (!Number.isInteger(address)) return 'The address must be a whole number from 1 to 512.';
	if (r.f.control.kind === 'dmx-map') return 'This fixture is addressed per parameter: change it on its fixture page.';
	return { control: { kind: 'dmx', universeId: d.universeId, address } };
}
