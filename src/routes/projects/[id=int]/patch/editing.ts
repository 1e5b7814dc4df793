import type { FixtureControl } from '$lib/patch';
import { parseAddressText } from '$lib/address-text';
import type { RowView } from './rows';

// What one inline edit sends: only the field that changed, plus the version
// the row was read at (DESIGN.md: PATCH takes any subset plus `version`).

export interface Draft {
	rowId: string;
	col: string;
	label: string;
	modeId: number;
	/** "2.101"; empty or "none" takes the fixture off DMX (manual) */
	address: string;
}

export function draftFor(r: RowView, col: string, universeNumber: (id: number) => number | undefined): Draft {
	const c = r.f.control;
	const u = c.kind === 'dmx' && c.universeId != null ? universeNumber(c.universeId) : undefined;
	return {
		rowId: r.id,
		col,
		label: r.f.label,
		modeId: r.f.modeId,
		address: c.kind === 'dmx' ? `${u ?? ''}${u ? '.' : ''}${c.address}` : ''
	};
}

export type EditBody = { label: string } | { modeId: number } | { control: FixtureControl };

/** The PATCH fields for a draft, or a sentence saying why it cannot be sent. */
export function bodyFor(d: Draft, r: RowView, universeByNumber: (n: number) => number | undefined): EditBody | string {
	if (d.col === 'label') {
		const label = d.label.trim();
		return label ? { label } : 'A label cannot be empty.';
	}
	if (d.col === 'typeMode') return { modeId: d.modeId };
	const text = d.address.trim();
	if (text === '' || text.toLowerCase() === 'none') return { control: { kind: 'manual' } };
	const parsed = parseAddressText(text);
	if (!parsed.ok) return parsed.message;
	const c = r.f.control;
	const current = c.kind === 'dmx' ? c.universeId : null;
	const universeId = parsed.universe !== null ? universeByNumber(parsed.universe) : current;
	if (parsed.universe !== null && universeId === undefined)
		return `There is no universe ${parsed.universe} in this project; add it under Universes first.`;
	if (universeId == null) return 'Write the universe too, e.g. 2.101.';
	return { control: { kind: 'dmx', universeId, address: parsed.address } };
}
