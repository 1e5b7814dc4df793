import { bytesOf, parameterSlots, type Conflict, type Mode } from '../../patch/index';
import type { PatchData } from '../db/patch';
import { TRANSPORT_LABELS } from '../../vocab';
import {
	heading,
	openSheet,
	paragraph,
	Table,
	type Column,
	type Cursor,
	type Paper,
	type TableStyle,
	type TitleInfo
} from './common';

// The desk's sheet: every universe in address order, then the radio-driven,
// manual and unpatched fixtures, conflicts flagged on the row and listed first.

type Fixture = PatchData['fixtures'][number];
type Universe = PatchData['universes'][number];

export interface Lookup {
	modeById: Map<number, Mode & { typeId: number }>;
	typeById: Map<number, PatchData['types'][number]>;
	fixtureById: Map<number, Fixture>;
}

export function lookup(patch: PatchData): Lookup {
	const modeById = new Map<number, Mode & { typeId: number }>();
	const typeById = new Map<number, PatchData['types'][number]>();
	for (const t of patch.types) {
		typeById.set(t.id, t);
		for (const m of t.modes) modeById.set(m.id, { ...m, typeId: t.id });
	}
	return { modeById, typeById, fixtureById: new Map(patch.fixtures.map((f) => [f.id, f])) };
}

export function typeAndMode(l: Lookup, f: Pick<Fixture, 'typeId' | 'modeId'>): string {
	const t = l.typeById.get(f.typeId);
	const m = l.modeById.get(f.modeId);
	return `${t ? `${t.maker} ${t.model}` : `type ${f.typeId}`} · ${m ? m.name : `mode ${f.modeId}`}`;
}

/** "7.505–512", "4.20, 4.30–31": universe number, then each run of slots. */
export function addressText(
	universeNumber: number | string,
	ranges: readonly { start: number; end: number }[]
): string {
	return ranges.map((r) => `${universeNumber}.${r.start}${r.end === r.start ? '' : `–${r.end}`}`).join(', ');
}

type DmxLike = Extract<Fixture['control'], { kind: 'dmx' | 'dmx-map' }>;

/**
 * Each parameter at its absolute universe.address: "4.20 intensity · 4.30/31 hue" (a 16-bit
 * parameter shows coarse/fine). `universe` names the universe of each DMX break.
 */
export function parameterAddresses(
	universe: number | string | ((dmxBreak: number) => number | string),
	mode: Mode,
	control: DmxLike
): string {
	return parameterSlots(control, mode)
		.map((p, i) => {
			if (mode.channels[i]?.offset === null) return `${p.parameter} (no slot)`;
			if (p.slots.length === 0) return `${p.parameter} (no address)`;
			const u = typeof universe === 'function' ? universe(p.dmxBreak ?? 1) : universe;
			return `${u}.${p.slots.join('/')} ${p.parameter}`;
		})
		.join(' · ');
}

/**
 * The footprint as a crew reads it off the unit: "1/2 intensity · 3 hue" (offset, parameter; a
 * 16-bit parameter shows coarse/fine offsets). A dmx-map fixture, or any DMX fixture when the
 * sheet asks for absolute addresses, lists each parameter's universe.address instead.
 */
export function channelList(
	mode: Mode | undefined,
	control: Fixture['control'],
	absolute?: (dmxBreak: number) => number | string
): string {
	if (!mode) return '';
	if (control.kind === 'dmx-map' || (absolute && control.kind === 'dmx'))
		return parameterAddresses(absolute ?? '?', mode, control);
	const parts: string[] = [];
	for (const ch of mode.channels) {
		if (ch.offset === null) {
			parts.push(`${ch.parameter} (no slot)`);
			continue;
		}
		const n = bytesOf(ch.bits);
		if (n === 1) parts.push(`${ch.offset} ${ch.parameter}`);
		else if (n === 2) parts.push(`${ch.offset}/${ch.offset + 1} ${ch.parameter}`);
		else parts.push(`${ch.offset}–${ch.offset + n - 1} ${ch.parameter} (${ch.bits}-bit)`);
	}
	return parts.join(' · ');
}

/** The universe's one summary line: transport in words, numbers, fixtures, slots in use, refresh. */
export function universeLine(u: Universe, fixtures: number, slotsInUse: number): string {
	const parts: string[] = [TRANSPORT_LABELS[u.transport] ?? u.transport];
	if (u.transport === 'sacn') parts.push(u.sacn ? `sACN ${u.sacn.universe}, group ${u.sacn.group}` : 'no sACN number');
	if (u.transport === 'artnet') {
		parts.push(
			u.artnet
				? `Art-Net ${u.artnet.net}:${u.artnet.subnet}:${u.artnet.universe} (port-address ${u.artnet.portAddress})`
				: 'no Art-Net port-address'
		);
	}
	parts.push(
		`${fixtures} ${fixtures === 1 ? 'fixture' : 'fixtures'}`,
		`${slotsInUse} of 512 slots used, highest ${u.slotsUsed}`,
		`refresh ${u.refreshText}`
	);
	if (u.artnetCaution) parts.push(u.artnetCaution);
	return parts.join(' · ');
}

/** "ch 1 intensity, 2 hue, 3 saturation": every channel, in channel order. */
export function rcChannelText(channels: Record<string, number>): string {
	const list = Object.entries(channels).sort((a, b) => a[1] - b[1] || a[0].localeCompare(b[0]));
	return list.length ? `ch ${list.map(([p, ch]) => `${ch} ${p}`).join(', ')}` : 'no channels yet';
}

function range(start: number, end: number): number[] {
	const out: number[] = [];
	for (let i = Math.max(1, start); i <= Math.min(512, end); i++) out.push(i);
	return out;
}

function severityWord(c: Conflict): string {
	return c.severity === 'error' ? 'ERROR' : c.severity === 'warning' ? 'WARNING' : 'note';
}

// Columns sized so a typical row takes one line at 7 pt: a cell that does not fit shrinks to 5.5 pt
// first; type · mode and label never wrap (they end in an ellipsis past 5.5 pt), the rest may wrap.
export const PATCH_COLUMNS: Column[] = [
	{ key: 'address', title: 'Address', width: 7.5 },
	{ key: 'number', title: 'No.', width: 3.5, align: 'right', fit: 'shrink' },
	{ key: 'label', title: 'Label', width: 10, fit: 'shrink' },
	{ key: 'type', title: 'Type · mode', width: 19, fit: 'shrink' },
	{ key: 'channels', title: 'Channels (offset parameter; a/b = coarse/fine)', width: 24 },
	{ key: 'position', title: 'Position', width: 13 },
	{ key: 'group', title: 'Group', width: 9 },
	{ key: 'notes', title: 'Notes', width: 14 }
];

const ABSOLUTE_COLUMNS: Column[] = PATCH_COLUMNS.map((c) =>
	c.key === 'channels' ? { ...c, title: 'Channels (universe.address parameter)' } : c
);

const OTHER_COLUMNS: Column[] = [
	{ key: 'number', title: 'No.', width: 4, align: 'right', fit: 'shrink' },
	{ key: 'label', title: 'Label', width: 10, fit: 'shrink' },
	{ key: 'type', title: 'Type · mode', width: 19, fit: 'shrink' },
	{ key: 'control', title: 'Control (RC: receiver · channel parameter)', width: 27 },
	{ key: 'position', title: 'Position', width: 13 },
	{ key: 'group', title: 'Group', width: 11 },
	{ key: 'notes', title: 'Notes', width: 16 }
];

/** Dense rows: 7 pt text, 5.5 pt at the least before a cell wraps or ends in an ellipsis. */
export const PATCH_STYLE: TableStyle = { fontSize: 7, minFontSize: 5.5, padding: 1, maxLines: 3 };

export interface PatchSheetOptions {
	/** every DMX parameter at its universe.address, not as an offset from the start address */
	absolute?: boolean;
}

const FOLLOWER_INDENT = 10;

export async function renderPatchSheet(
	patch: PatchData,
	title: TitleInfo,
	paper: Paper,
	options: PatchSheetOptions = {}
): Promise<Buffer> {
	const sheet = openSheet({ paper, layout: 'landscape', title, compact: true });
	const cursor: Cursor = { y: sheet.top };
	const l = lookup(patch);

	const flagged = new Set<number>();
	for (const c of patch.conflicts) if (c.severity !== 'info') for (const id of c.fixtureIds) flagged.add(id);

	const followersOf = new Map<number, Fixture[]>();
	for (const f of patch.fixtures) {
		if (f.control.kind !== 'follow') continue;
		const leader = l.fixtureById.get(f.control.leaderId);
		if (!leader || leader.id === f.id) continue;
		const list = followersOf.get(leader.id) ?? [];
		list.push(f);
		followersOf.set(leader.id, list);
	}
	const printed = new Set<number>();

	const common = (f: Fixture) => ({
		number: String(f.number),
		label: f.label,
		type: typeAndMode(l, f),
		position: f.position,
		group: [f.group, f.linkGroup ? `link ${f.linkGroup}` : ''].filter(Boolean).join(' · '),
		notes: f.notes
	});

	// Followers sit under their leader wherever it is printed, one level deeper each time.
	const withFollowers = (table: Table, f: Fixture, cells: Record<string, string>, depth = 0) => {
		printed.add(f.id);
		table.row({ cells, flag: flagged.has(f.id), indent: depth * FOLLOWER_INDENT });
		for (const follower of followersOf.get(f.id) ?? []) {
			if (printed.has(follower.id)) continue;
			const c = common(follower);
			withFollowers(
				table,
				follower,
				{
					...c,
					address: `${flagged.has(follower.id) ? '! ' : ''}follows ${f.number}`,
					label: `› ${c.label}`,
					channels: 'own link from its leader'
				},
				depth + 1
			);
		}
	};

	// ── Conflicts first ──
	const listed = patch.conflicts.filter((c) => c.severity !== 'info');
	heading(
		sheet,
		cursor,
		listed.length === 0 ? 'No conflicts' : `Conflicts (${listed.length}) — rows marked ! and with a bar`,
		9.5,
		12
	);
	for (const c of listed) paragraph(sheet, cursor, `${severityWord(c)}  ${c.message}`, 7.5);
	const links = patch.conflicts.filter((c) => c.kind === 'linked');
	if (links.length) paragraph(sheet, cursor, `Intended links: ${links.map((c) => c.message).join('; ')}`, 7.5);
	cursor.y += 4;

	// ── Universes ──
	const universeNumber = new Map(patch.universes.map((x) => [x.id, x.number]));
	for (const u of patch.universes) {
		// a fixture of a multi-break mode is listed on each universe one of its breaks lands on
		const rows = patch.fixtures
			.flatMap((f) => {
				const own = (f.control.kind === 'dmx' || f.control.kind === 'dmx-map') && f.control.universeId === u.id;
				const more = (f.breakSlots ?? []).filter((b) => b.universeId === u.id);
				return [
					...(own ? [{ f, slots: f.slots, dmxBreak: f.breakSlots ? 1 : 0 }] : []),
					...more.map((b) => ({ f, slots: b.ranges, dmxBreak: b.dmxBreak }))
				];
			})
			.sort((a, b) => (a.slots[0]?.start ?? 1e9) - (b.slots[0]?.start ?? 1e9) || a.f.number - b.f.number);
		const caption = `Universe ${u.number}${u.name ? ` — ${u.name}` : ''}`;
		const own = new Set(rows.map((r) => r.f.id));
		// linked fixtures share their slots: count each slot once
		const inUse = new Set(rows.flatMap((r) => r.slots.flatMap((x) => range(x.start, x.end)))).size;
		heading(sheet, cursor, caption, 9.5, 40, universeLine(u, own.size, inUse) + (u.notes ? ` · ${u.notes}` : ''));
		const table = new Table(
			sheet,
			options.absolute ? ABSOLUTE_COLUMNS : PATCH_COLUMNS,
			cursor,
			PATCH_STYLE,
			caption,
			'label'
		);
		if (rows.length === 0) {
			paragraph(sheet, cursor, 'Nothing patched in this universe.', 7.5);
			cursor.y += 4;
			continue;
		}
		table.start();
		// a parameter on a later DMX break may sit in another universe
		const universeOf = (f: Fixture) => (dmxBreak: number) => {
			const c = f.control;
			if (c.kind !== 'dmx' && c.kind !== 'dmx-map') return '?';
			const id =
				dmxBreak <= 1 || c.kind !== 'dmx' ? c.universeId : c.breaks?.find((b) => b.dmxBreak === dmxBreak)?.universeId;
			return id == null ? '?' : (universeNumber.get(id) ?? '?');
		};
		for (const { f, slots, dmxBreak } of rows) {
			const address =
				(slots.length ? addressText(u.number, slots) : `${u.number}.? (off the universe)`) +
				(dmxBreak > 0 ? ` (break ${dmxBreak})` : '');
			withFollowers(table, f, {
				...common(f),
				address: `${flagged.has(f.id) ? '! ' : ''}${address}`,
				channels: channelList(
					l.modeById.get(f.modeId),
					f.control,
					options.absolute || f.control.kind === 'dmx-map' ? universeOf(f) : undefined
				)
			});
		}
		cursor.y += 4;
	}

	// ── Off the universes: radio-driven first, then manual, then anything not printed yet
	// (unpatched DMX, followers of a missing leader), in one table so short lists cost one header ──
	const receiverName = new Map(patch.receivers.map((r) => [r.id, r.name]));
	const order = (f: Fixture) => (f.control.kind === 'rc' ? 0 : f.control.kind === 'manual' ? 1 : 2);
	const rest = patch.fixtures
		.filter((f) => !printed.has(f.id))
		.sort((a, b) => order(a) - order(b) || a.number - b.number);
	if (rest.length) {
		const caption = 'Radio, manual and not patched';
		heading(sheet, cursor, caption, 9.5, 40);
		const table = new Table(sheet, OTHER_COLUMNS, cursor, PATCH_STYLE, caption, 'label');
		table.start();
		for (const f of rest) {
			if (printed.has(f.id)) continue;
			const c = f.control;
			const control =
				c.kind === 'rc'
					? `RC ${c.receiverId === null ? 'no receiver' : (receiverName.get(c.receiverId) ?? `receiver ${c.receiverId}`)} · ${rcChannelText(c.channels)}`
					: c.kind === 'manual'
						? 'manual: set by hand on the unit'
						: c.kind === 'follow'
							? `follows ${l.fixtureById.get(c.leaderId)?.number ?? 'a missing fixture'}`
							: 'DMX, not patched to a universe';
			withFollowers(table, f, { ...common(f), number: `${flagged.has(f.id) ? '! ' : ''}${f.number}`, control });
		}
	}

	return sheet.finish();
}
