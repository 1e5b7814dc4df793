import { bytesOf, parameterSlots, type Conflict, type Mode } from '../../patch/index';
import type { PatchData } from '../db/patch';
import { heading, openSheet, paragraph, Table, type Column, type Cursor, type Paper, type TitleInfo } from './common';

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

/**
 * The footprint as a crew reads it off the unit: "1/2 intensity · 3 hue" (offset,
 * parameter; a 16-bit parameter shows coarse/fine offsets). For a dmx-map
 * fixture each parameter's own address: "intensity @20 · hue @30/31".
 */
export function channelList(mode: Mode | undefined, control: Fixture['control']): string {
	if (!mode) return '';
	if (control.kind === 'dmx-map') {
		return parameterSlots(control, mode)
			.map((p) => {
				if (p.slots.length === 0) return `${p.parameter} @–`;
				return `${p.parameter} @${p.slots.join('/')}`;
			})
			.join(' · ');
	}
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

export function universeLine(u: Universe): string {
	const parts: string[] = [u.transport];
	if (u.transport === 'sacn') parts.push(u.sacn ? `sACN ${u.sacn.universe}, group ${u.sacn.group}` : 'no sACN number');
	if (u.transport === 'artnet') {
		parts.push(
			u.artnet
				? `Art-Net ${u.artnet.net}:${u.artnet.subnet}:${u.artnet.universe} (port-address ${u.artnet.portAddress})`
				: 'no Art-Net port-address'
		);
	}
	parts.push(`highest slot ${u.slotsUsed}`, `refresh ${u.refreshText}`);
	if (u.artnetCaution) parts.push(u.artnetCaution);
	return parts.join(' · ');
}

function severityWord(c: Conflict): string {
	return c.severity === 'error' ? 'ERROR' : c.severity === 'warning' ? 'WARNING' : 'note';
}

export const PATCH_COLUMNS: Column[] = [
	{ key: 'address', title: 'Address', width: 8 },
	{ key: 'number', title: 'No.', width: 4, align: 'right' },
	{ key: 'label', title: 'Label', width: 11 },
	{ key: 'type', title: 'Type · mode', width: 15 },
	{ key: 'channels', title: 'Channels (offset parameter; a/b = coarse/fine)', width: 24 },
	{ key: 'position', title: 'Position', width: 12 },
	{ key: 'group', title: 'Group', width: 10 },
	{ key: 'notes', title: 'Notes', width: 16 }
];

const RC_COLUMNS: Column[] = [
	{ key: 'number', title: 'No.', width: 4, align: 'right' },
	{ key: 'label', title: 'Label', width: 12 },
	{ key: 'type', title: 'Type · mode', width: 16 },
	{ key: 'receiver', title: 'Receiver', width: 11 },
	{ key: 'channels', title: 'Radio channels', width: 21 },
	{ key: 'position', title: 'Position', width: 12 },
	{ key: 'group', title: 'Group', width: 9 },
	{ key: 'notes', title: 'Notes', width: 15 }
];

const PLAIN_COLUMNS: Column[] = [
	{ key: 'number', title: 'No.', width: 4, align: 'right' },
	{ key: 'label', title: 'Label', width: 14 },
	{ key: 'type', title: 'Type · mode', width: 20 },
	{ key: 'control', title: 'Control', width: 16 },
	{ key: 'position', title: 'Position', width: 14 },
	{ key: 'group', title: 'Group', width: 10 },
	{ key: 'notes', title: 'Notes', width: 22 }
];

const FOLLOWER_INDENT = 10;

export async function renderPatchSheet(patch: PatchData, title: TitleInfo, paper: Paper): Promise<Buffer> {
	const sheet = openSheet({ paper, layout: 'landscape', title });
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
		group: [f.group, f.linkGroup ? `link: ${f.linkGroup}` : ''].filter(Boolean).join('\n'),
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
		10,
		12
	);
	for (const c of listed) paragraph(sheet, cursor, `${severityWord(c)}  ${c.message}`, 7.5);
	const links = patch.conflicts.filter((c) => c.kind === 'linked');
	if (links.length) paragraph(sheet, cursor, `Intended links: ${links.map((c) => c.message).join('; ')}`, 7.5);
	cursor.y += 6;

	// ── Universes ──
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
		heading(sheet, cursor, caption, 11, 60);
		paragraph(sheet, cursor, universeLine(u) + (u.notes ? ` · ${u.notes}` : ''), 8);
		const table = new Table(sheet, PATCH_COLUMNS, cursor, undefined, caption, 'label');
		if (rows.length === 0) {
			paragraph(sheet, cursor, 'Nothing patched in this universe.', 8);
			cursor.y += 8;
			continue;
		}
		table.start();
		for (const { f, slots, dmxBreak } of rows) {
			const address =
				(slots.length ? addressText(u.number, slots) : `${u.number}.? (off the universe)`) +
				(dmxBreak > 0 ? ` (break ${dmxBreak})` : '');
			withFollowers(table, f, {
				...common(f),
				address: `${flagged.has(f.id) ? '! ' : ''}${address}`,
				channels: channelList(l.modeById.get(f.modeId), f.control)
			});
		}
		cursor.y += 10;
	}

	// ── Radio-driven ──
	const receiverName = new Map(patch.receivers.map((r) => [r.id, r.name]));
	const rc = patch.fixtures.filter((f) => f.control.kind === 'rc').sort((a, b) => a.number - b.number);
	if (rc.length) {
		heading(sheet, cursor, 'Driven by RC radio', 11, 40);
		const table = new Table(sheet, RC_COLUMNS, cursor, undefined, 'Driven by RC radio', 'label');
		table.start();
		for (const f of rc) {
			if (f.control.kind !== 'rc') continue;
			const channels = Object.entries(f.control.channels)
				.sort((a, b) => a[1] - b[1])
				.map(([p, ch]) => `ch ${ch} ${p}`)
				.join(' · ');
			withFollowers(table, f, {
				...common(f),
				number: `${flagged.has(f.id) ? '! ' : ''}${f.number}`,
				receiver:
					f.control.receiverId === null
						? 'no receiver'
						: (receiverName.get(f.control.receiverId) ?? `receiver ${f.control.receiverId}`),
				channels: channels || 'none assigned'
			});
		}
		cursor.y += 10;
	}

	// ── Manual ──
	const manual = patch.fixtures.filter((f) => f.control.kind === 'manual').sort((a, b) => a.number - b.number);
	if (manual.length) {
		heading(sheet, cursor, 'Set by hand on the unit (manual)', 11, 40);
		const table = new Table(sheet, PLAIN_COLUMNS, cursor, undefined, 'Set by hand on the unit', 'label');
		table.start();
		for (const f of manual) withFollowers(table, f, { ...common(f), control: 'manual' });
		cursor.y += 10;
	}

	// ── Anything not printed yet: unpatched DMX, followers of a missing leader ──
	const rest = patch.fixtures.filter((f) => !printed.has(f.id)).sort((a, b) => a.number - b.number);
	if (rest.length) {
		heading(sheet, cursor, 'Not patched', 11, 40);
		const table = new Table(sheet, PLAIN_COLUMNS, cursor, undefined, 'Not patched', 'label');
		table.start();
		for (const f of rest) {
			const control =
				f.control.kind === 'follow'
					? `follows ${l.fixtureById.get(f.control.leaderId)?.number ?? 'a missing fixture'}`
					: f.control.kind === 'dmx' || f.control.kind === 'dmx-map'
						? 'DMX, no universe'
						: f.control.kind;
			withFollowers(table, f, { ...common(f), number: `${flagged.has(f.id) ? '! ' : ''}${f.number}`, control });
		}
	}

	return sheet.finish();
}
