import type { PowerView } from '../db/power';
import {
	heading,
	openSheet,
	paragraph,
	Table,
	TABLE_STYLE,
	type Column,
	type Cursor,
	type Paper,
	type TitleInfo
} from './common';

// The power sheet (issue 15): for the battery tech and the electrician — each pack type with its
// fixtures, runtimes and swap times, the shortfalls, and each circuit's load against its breaker.

export const POWER_CAUTION =
	'Caution: take damaged or swollen lithium packs off set; charge under supervision. Mains is made and checked by a licensed electrician. Breaker figures follow NEC 210.19(A)/210.20(A) practice (80 % for continuous load); local codes differ and govern.';

const PACK_COLUMNS: Column[] = [
	{ key: 'fixture', title: 'Fixture', width: 22 },
	{ key: 'draw', title: 'Draw (look / full)', width: 14, align: 'right' },
	{ key: 'current', title: 'A at pack low', width: 10, align: 'right' },
	{ key: 'runtime', title: 'Runtime (look / full)', width: 16, align: 'right' },
	{ key: 'swaps', title: 'Swap at', width: 38 }
];

const CIRCUIT_COLUMNS: Column[] = [
	{ key: 'name', title: 'Circuit', width: 22 },
	{ key: 'supply', title: 'Supply', width: 16 },
	{ key: 'load', title: 'Load', width: 18, align: 'right' },
	{ key: 'percent', title: '% of breaker', width: 10, align: 'right' },
	{ key: 'fixtures', title: 'Fixtures', width: 34 }
];

const hm = (min: number | null) =>
	min == null ? '—' : `${Math.floor(min / 60)} h ${String(Math.round(min % 60)).padStart(2, '0')}`;

function clock(start: string, after: number): string {
	const [h, m] = start.split(':').map(Number);
	const t = (h! * 60 + m! + after) % 1440;
	return `${String(Math.floor(t / 60)).padStart(2, '0')}:${String(t % 60).padStart(2, '0')}`;
}

export async function renderPowerSheet(view: PowerView, title: TitleInfo, paper: Paper): Promise<Buffer> {
	const sheet = openSheet({ paper, title });
	const cursor: Cursor = { y: sheet.top };
	const p = view.power;
	const number = new Map(view.fixtures.map((f) => [f.id, f]));

	paragraph(sheet, cursor, POWER_CAUTION, 8, true);
	cursor.y += 4;
	paragraph(
		sheet,
		cursor,
		`Shooting day ${p.day.start}–${p.day.wrap}; runtimes plan on ${Math.round(view.settings.usableFraction * 100)} % of each pack's rated energy (common practice); draw at the look scales linearly with intensity above the type's floor (common practice for LED engines).`,
		8
	);
	cursor.y += 4;
	heading(
		sheet,
		cursor,
		p.day.shortfalls.length ? `Shortfalls (${p.day.shortfalls.length})` : 'Shortfalls: none',
		11,
		30
	);
	for (const s of p.day.shortfalls) paragraph(sheet, cursor, s.message, 9, true);
	cursor.y += 6;

	for (const pack of p.packTypes) {
		const caption = `${pack.name} — ${pack.cells} cells, ${pack.nominalVolts} V (${pack.emptyVolts}–${pack.fullVolts} V), ${pack.wattHours} Wh, ${pack.maxCurrentA} A max, ${pack.onHand} on hand${pack.packsShort ? ` (${pack.packsShort} short)` : ''}`;
		heading(sheet, cursor, caption, 10, 60);
		const air =
			pack.airTravel === 'ok'
				? 'Air travel: up to 100 Wh, carry-on (IATA).'
				: pack.airTravel === 'approval'
					? 'Air travel: 100–160 Wh, airline approval needed (IATA).'
					: 'Air travel: above 160 Wh, not as passenger baggage (IATA).';
		paragraph(
			sheet,
			cursor,
			`${air} Charging: ${pack.chargeHours ? `${pack.chargeHours} h on ${pack.chargerSlots} bays` : 'none planned during the day'}.`,
			8
		);
		for (const w of pack.warnings) paragraph(sheet, cursor, `! ${w.message}`, 8, true);
		if (pack.fixtures.length === 0) {
			paragraph(sheet, cursor, 'No fixtures on this pack type.', 8);
			cursor.y += 8;
			continue;
		}
		// every swap time prints: a long day of short packs wraps onto more lines instead of an ellipsis
		const table = new Table(sheet, PACK_COLUMNS, cursor, { ...TABLE_STYLE, maxLines: 12 }, caption);
		table.start();
		for (const f of pack.fixtures) {
			const events = p.day.timeline.find((t) => t.fixtureId === f.fixtureId)?.events ?? [];
			const swaps = events
				.filter((e) => e.kind !== 'start')
				.map((e) => `${e.kind === 'dark' ? 'DARK ' : e.kind === 'relit' ? 'relit ' : ''}${clock(p.day.start, e.at)}`);
			table.row({
				cells: {
					fixture: `${f.number} ${f.label}`,
					draw: f.drawW == null ? 'no data' : `${f.drawW} / ${f.drawFullW} W`,
					current: f.currentA == null ? '—' : f.currentA.toFixed(1),
					runtime: `${hm(f.runtimeMin)} / ${hm(f.runtimeFullMin)}`,
					swaps: swaps.length ? swaps.join(', ') : 'none before the wrap'
				},
				flag: pack.warnings.some((w) => w.fixtureId === f.fixtureId) || events.some((e) => e.kind === 'dark'),
				bold: false
			});
		}
		cursor.y += 10;
	}

	heading(sheet, cursor, 'Mains circuits', 11, 60);
	if (p.circuits.length === 0) paragraph(sheet, cursor, 'No circuits in this project.', 8);
	else {
		const table = new Table(sheet, CIRCUIT_COLUMNS, cursor, undefined, 'Mains circuits');
		table.start();
		for (const c of p.circuits) {
			table.row({
				cells: {
					name: c.name,
					supply: `${c.volts} V, ${c.breakerA} A, PF ${c.powerFactor}`,
					load: `${c.loadW} W · ${c.currentA.toFixed(1)} A`,
					percent: `${c.percentOfBreaker} %`,
					fixtures: c.fixtureIds.map((id) => number.get(id)?.number ?? '?').join(', ')
				},
				flag: c.warnings.length > 0,
				bold: false
			});
		}
		cursor.y += 6;
		for (const c of p.circuits)
			for (const w of c.warnings) paragraph(sheet, cursor, `! ${c.name}: ${w.message}`, 8, true);
	}
	return sheet.finish();
}
