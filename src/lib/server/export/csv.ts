import Papa from 'papaparse';
import { formatSlots } from '../../patch/index';
import { loadPatch } from '../db/patch';
import { listCircuits, listPackTypes } from '../db/power';
import { feedText } from '../power-csv';

// The patch for a desk or a spreadsheet: one row per fixture. The first
// columns are the ones the CSV import reads, so a file exported here can be
// edited and imported back.

export const CSV_COLUMNS = [
	'number',
	'label',
	'maker',
	'model',
	'mode',
	'universe',
	'address',
	'position',
	'group',
	'notes',
	'control',
	'range',
	'receiver',
	'rc channels',
	'slots',
	'link group',
	'state',
	'feed'
] as const;

// OWASP "CSV injection": a text cell starting with = + - @ tab or CR gets a leading quote.
// Papaparse's own default pattern ends in `.*$` and so misses a formula followed by a newline.
const FORMULA = /^[=+\-@\t\r]/;

export function toCsv(rows: (string | number)[][]): string {
	return Papa.unparse({ fields: [...CSV_COLUMNS], data: rows }, { escapeFormulae: FORMULA, newline: '\r\n' });
}

export function exportPatchCsv(projectId: number): string {
	const p = loadPatch(projectId);
	const feedNames = { packTypes: listPackTypes(projectId), circuits: listCircuits(projectId) };
	const universes = new Map(p.universes.map((u) => [u.id, u.number]));
	const receivers = new Map(p.receivers.map((r) => [r.id, r.name]));
	const byId = new Map(p.fixtures.map((f) => [f.id, f]));
	const modeOf = new Map(p.types.flatMap((t) => t.modes.map((m) => [m.id, { type: t, mode: m }] as const)));
	const rows = p.fixtures.map((f) => {
		const tm = modeOf.get(f.modeId);
		const c = f.control;
		let universe: number | string = '';
		let address: number | string = '';
		let range = '';
		let control: string = c.kind;
		let receiver = '';
		let rc = '';
		if (c.kind === 'dmx') {
			universe = universes.get(c.universeId ?? -1) ?? '';
			address = c.address;
			range = f.slots.length
				? `${universe}.${formatSlots(f.slots.flatMap((s) => Array.from({ length: s.end - s.start + 1 }, (_, i) => s.start + i)))}`
				: '';
			// breaks 2…n of a multi-break mode follow in the range column: "1.1–6; break 2 2.10–13"
			for (const b of f.breakSlots ?? []) {
				const bu = universes.get(b.universeId ?? -1) ?? '?';
				range += `; break ${b.dmxBreak} ${b.ranges.length ? `${bu}.${formatSlots(b.ranges.flatMap((s) => Array.from({ length: s.end - s.start + 1 }, (_, i) => s.start + i)))}` : `${bu}.?`}`;
			}
		} else if (c.kind === 'dmx-map') {
			// no single start address: the universe and address columns stay empty (an import then keeps the map)
			// and the range column carries each parameter's universe.address
			const u = universes.get(c.universeId ?? -1) ?? '?';
			const bits = new Map(tm?.mode.channels.map((ch) => [ch.parameter, ch.bits]) ?? []);
			range = Object.entries(c.addresses)
				.sort((a, b) => a[1] - b[1])
				.map(([param, a]) => {
					const n = (bits.get(param) ?? 8) / 8;
					return `${param} ${u}.${n > 1 ? `${a}–${a + n - 1}` : a}`;
				})
				.join('; ');
		} else if (c.kind === 'rc') {
			receiver = receivers.get(c.receiverId ?? -1) ?? '';
			rc = Object.entries(c.channels)
				.sort((a, b) => a[1] - b[1])
				.map(([param, ch]) => `${param} ${ch}`)
				.join('; ');
		} else if (c.kind === 'follow') {
			control = `follow ${byId.get(c.leaderId)?.number ?? '?'}`;
		}
		return [
			f.number,
			f.label,
			tm?.type.maker ?? '',
			tm?.type.model ?? '',
			tm?.mode.name ?? '',
			universe,
			address,
			f.position,
			f.group,
			f.notes,
			control,
			range,
			receiver,
			rc,
			f.footprint ?? '',
			f.linkGroup ?? '',
			f.state,
			feedText(f.feed, feedNames)
		];
	});
	return toCsv(rows);
}
