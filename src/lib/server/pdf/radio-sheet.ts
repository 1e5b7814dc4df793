import { RC_CHANNEL_POOLS, RC_RAW_MAX, RC_RAW_MIN, rcRawToMicros, type RcProtocol } from '../../patch/index';
import type { PatchData } from '../db/patch';
import { heading, openSheet, paragraph, Table, type Column, type Cursor, type Paper, type TitleInfo } from './common';
import { lookup } from './patch-sheet';

// For whoever holds the transmitter: per receiver every channel, its stick or
// knob, what it drives and the values it sends; then what has no channel yet.

const COLUMNS: Column[] = [
	{ key: 'channel', title: 'Ch', width: 4, align: 'right' },
	{ key: 'control', title: 'Stick / knob / switch', width: 18 },
	{ key: 'parameter', title: 'Parameter', width: 14 },
	{ key: 'fixtures', title: 'Fixture(s)', width: 34 },
	{ key: 'range', title: 'Value range', width: 22 }
];

export const RC_CAUTION =
	'Caution: check each receiver\u2019s failsafe (what the fixtures do when the link drops) before a rig flies, moves or goes up. Defer to local codes and licensed practice.';

/** What a channel sends end to end, from the engine's conversions: raw 172–1811 is 988–2012 µs. */
export function valueRange(protocol: RcProtocol, channel: number): string {
	const p = RC_CHANNEL_POOLS[protocol];
	if (channel > p.proportional) return 'on / off (digital)';
	const us = `${Math.round(rcRawToMicros(RC_RAW_MIN))}–${Math.round(rcRawToMicros(RC_RAW_MAX))} µs`;
	return protocol === 'ppm' ? us : `raw ${RC_RAW_MIN}–${RC_RAW_MAX} · ${us}`;
}

export async function renderRadioSheet(patch: PatchData, title: TitleInfo, paper: Paper): Promise<Buffer> {
	const sheet = openSheet({ paper, title });
	const cursor: Cursor = { y: sheet.top };
	const l = lookup(patch);
	const rc = patch.fixtures.filter((f) => f.control.kind === 'rc').sort((a, b) => a.number - b.number);

	paragraph(sheet, cursor, RC_CAUTION, 8, true);
	cursor.y += 4;
	if (patch.receivers.length === 0) paragraph(sheet, cursor, 'This patch has no receivers.', 9);

	for (const r of patch.receivers) {
		const caption = `${r.name} — ${r.protocol.toUpperCase()}, ${r.channelCount} channels`;
		heading(sheet, cursor, caption, 11, 60);
		if (r.transmitterNotes) paragraph(sheet, cursor, `Transmitter: ${r.transmitterNotes}`, 8);
		const byChannel = new Map<number, { parameter: string; fixtures: string[] }[]>();
		for (const f of rc) {
			if (f.control.kind !== 'rc' || f.control.receiverId !== r.id) continue;
			for (const [parameter, ch] of Object.entries(f.control.channels)) {
				const list = byChannel.get(ch) ?? [];
				let entry = list.find((e) => e.parameter === parameter);
				if (!entry) list.push((entry = { parameter, fixtures: [] }));
				entry.fixtures.push(`${f.number} ${f.label}`);
				byChannel.set(ch, list);
			}
		}
		const table = new Table(sheet, COLUMNS, cursor, undefined, caption);
		table.start();
		const last = Math.max(r.channelCount, ...byChannel.keys());
		for (let ch = 1; ch <= last; ch++) {
			const uses = byChannel.get(ch) ?? [];
			const collision = uses.length > 1;
			table.row({
				cells: {
					channel: `${collision ? '! ' : ''}${ch}`,
					control: r.labels[String(ch)] ?? '',
					parameter: uses.length ? uses.map((u) => u.parameter).join(' / ') : 'free',
					fixtures: uses.map((u) => u.fixtures.join(', ')).join(' / '),
					range: ch > r.channelCount ? 'beyond this receiver' : valueRange(r.protocol, ch)
				},
				flag: collision || ch > r.channelCount,
				bold: uses.length > 0
			});
		}
		cursor.y += 12;
	}

	// Parameters of RC fixtures with no channel, and fixtures with no receiver.
	const receiverIds = new Set(patch.receivers.map((r) => r.id));
	const missing: string[] = [];
	for (const f of rc) {
		if (f.control.kind !== 'rc') continue;
		const mode = l.modeById.get(f.modeId);
		const params = [...new Set((mode?.channels ?? []).map((c) => c.parameter))];
		if (f.control.receiverId === null || !receiverIds.has(f.control.receiverId)) {
			missing.push(`${f.number} ${f.label}: no receiver`);
			continue;
		}
		const channels = f.control.channels;
		const unset = params.filter((p) => !Object.prototype.hasOwnProperty.call(channels, p));
		if (unset.length) missing.push(`${f.number} ${f.label}: ${unset.join(', ')}`);
	}
	heading(
		sheet,
		cursor,
		missing.length ? `Unassigned RC parameters (${missing.length} fixtures)` : 'Unassigned RC parameters: none',
		10,
		20
	);
	for (const m of missing) paragraph(sheet, cursor, m, 8);
	const rcConflicts = patch.conflicts.filter((c) => c.kind === 'rc-collision');
	if (rcConflicts.length) {
		cursor.y += 4;
		heading(sheet, cursor, 'Radio conflicts', 10, 20);
		for (const c of rcConflicts) paragraph(sheet, cursor, c.message, 8);
	}
	return sheet.finish();
}
