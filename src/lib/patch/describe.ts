import {
	diffFields,
	type FieldChange,
	type JsonValue,
	type PatchDiff,
	type SnapshotFixture,
	type SnapshotRecord
} from './diff';
import type { FixtureControl } from './types';

// What changed, in the words the crew uses on set: "Fixture 5 DECK 5 moved from 1.17 to 2.161".
// No field names and no database ids reach the reader; ids are looked up in the snapshot they belong to.

export interface DescribeSnapshot {
	fixtures: readonly SnapshotFixture[];
	universes?: readonly SnapshotRecord[];
	types?: readonly SnapshotRecord[];
	receivers?: readonly SnapshotRecord[];
}

/** plan: what the programmer decided (addresses, modes, fixtures in or out); progress: what happened on set. */
export type ChangeGroup = 'plan' | 'progress';

export interface ChangeLine {
	group: ChangeGroup;
	kind: 'added' | 'removed' | 'changed';
	/** Fixture number when the line is about one fixture, for sorting and linking. */
	fixture: number | null;
	text: string;
}

export interface DescribedChanges {
	plan: ChangeLine[];
	progress: ChangeLine[];
}

interface ModeInfo {
	type: string;
	mode: string;
	slots: number | null;
}

export interface DescribeContext {
	universes: Map<number, SnapshotRecord>;
	receivers: Map<number, SnapshotRecord>;
	fixtures: Map<number, SnapshotFixture>;
	modes: Map<number, ModeInfo>;
}

export function describeContext(s: DescribeSnapshot): DescribeContext {
	const modes = new Map<number, ModeInfo>();
	for (const t of s.types ?? []) {
		const list = Array.isArray(t.modes) ? t.modes : [];
		for (const m of list) {
			if (typeof m !== 'object' || m === null || Array.isArray(m) || typeof m.id !== 'number') continue;
			modes.set(m.id, {
				type: [t.maker, t.model].filter((x) => typeof x === 'string' && x !== '').join(' '),
				mode: typeof m.name === 'string' ? m.name : '',
				slots: typeof m.slots === 'number' ? m.slots : null
			});
		}
	}
	return {
		universes: new Map((s.universes ?? []).map((u) => [u.id, u])),
		receivers: new Map((s.receivers ?? []).map((r) => [r.id, r])),
		fixtures: new Map(s.fixtures.map((f) => [f.id, f])),
		modes
	};
}

function rangeList(ns: number[]): string {
	return ns.length === 0 ? '—' : [...ns].sort((a, b) => a - b).join(', ');
}

/** "2.161" — universe.address, the way the electrician dials it in (common practice). */
export function whereText(control: FixtureControl | undefined, ctx: DescribeContext): string {
	if (!control) return 'no control';
	const universe = (id: number | null) => {
		const u = id === null ? undefined : ctx.universes.get(id);
		return typeof u?.number === 'number' ? String(u.number) : 'no universe';
	};
	switch (control.kind) {
		case 'dmx':
			// DIN SPEC 15800 DMX mode: each further break has its own universe and start address
			return [
				`${universe(control.universeId)}.${control.address}`,
				...[...(control.breaks ?? [])]
					.sort((x, y) => x.dmxBreak - y.dmxBreak)
					.map((b) => `break ${b.dmxBreak} ${universe(b.universeId)}.${b.address}`)
			].join(', ');
		case 'dmx-map':
			return Object.entries(control.addresses)
				.sort((a, b) => a[1] - b[1])
				.map(([p, a]) => `${p} ${universe(control.universeId)}.${a}`)
				.join(', ');
		case 'rc': {
			const r = control.receiverId === null ? undefined : ctx.receivers.get(control.receiverId);
			return `radio ${r?.name ?? 'with no receiver'} channels ${rangeList(Object.values(control.channels))}`;
		}
		case 'follow': {
			const leader = ctx.fixtures.get(control.leaderId);
			return leader ? `following fixture ${leader.number} ${leader.label}` : 'following a removed fixture';
		}
		default:
			return 'set by hand on the unit';
	}
}

function modeText(modeId: unknown, ctx: DescribeContext): { text: string; slots: number | null } {
	const m = typeof modeId === 'number' ? ctx.modes.get(modeId) : undefined;
	return m ? { text: m.mode || 'unnamed mode', slots: m.slots } : { text: 'an unknown mode', slots: null };
}

function typeText(modeId: unknown, ctx: DescribeContext): string {
	const m = typeof modeId === 'number' ? ctx.modes.get(modeId) : undefined;
	return m?.type || 'an unknown type';
}

const quoted = (v: unknown) => (v === null || v === undefined || v === '' ? 'nothing' : `“${String(v)}”`);

export function fixtureName(f: Pick<SnapshotFixture, 'number' | 'label'>): string {
	return `Fixture ${f.number}${f.label ? ` ${f.label}` : ''}`;
}

const PLAIN_FIELDS: Record<string, string> = {
	label: 'name',
	position: 'position',
	group: 'group',
	linkGroup: 'link group',
	colour: 'colour',
	watts: 'watts'
};
const LOOK_FIELDS: Record<string, string> = {
	'look.hue': 'hue',
	'look.saturation': 'saturation',
	'look.intensity': 'intensity',
	'look.cct': 'colour temperature'
};

const STATE_WORDS: Record<string, string> = {
	planned: 'planned',
	hung: 'hung',
	addressed: 'addressed',
	checked: 'checked',
	fault: 'at fault'
};

/**
 * The phrases for one fixture that exists on both sides; the field list says which parts moved, the
 * snapshots say what they mean. Used by revision compares and by a fixture's history.
 */
export function fixturePhrases(
	before: SnapshotFixture,
	after: SnapshotFixture,
	fields: readonly FieldChange[],
	ctxBefore: DescribeContext,
	ctxAfter: DescribeContext
): { plan: string[]; progress: string[] } {
	const plan: string[] = [];
	const progress: string[] = [];
	const touched = (prefix: string) => fields.some((f) => f.field === prefix || f.field.startsWith(`${prefix}.`));

	if (touched('number')) plan.push(`renumbered from ${before.number} to ${after.number}`);
	if (touched('modeId') || touched('typeId')) {
		const was = modeText(before.modeId, ctxBefore);
		const now = modeText(after.modeId, ctxAfter);
		const wasType = typeText(before.modeId, ctxBefore);
		const nowType = typeText(after.modeId, ctxAfter);
		const slots =
			was.slots !== null && now.slots !== null && was.slots !== now.slots ? ` (${was.slots} → ${now.slots} slots)` : '';
		plan.push(
			wasType !== nowType
				? `type ${wasType} ${was.text} → ${nowType} ${now.text}${slots}`
				: `mode ${was.text} → ${now.text}${slots}`
		);
	}
	const wasWhere = whereText(before.control as FixtureControl | undefined, ctxBefore);
	const nowWhere = whereText(after.control as FixtureControl | undefined, ctxAfter);
	if (wasWhere !== nowWhere) plan.push(`moved from ${wasWhere} to ${nowWhere}`);
	for (const [key, word] of Object.entries(PLAIN_FIELDS)) {
		if (touched(key)) plan.push(`${word} ${quoted(before[key])} → ${quoted(after[key])}`);
	}
	const look = fields.filter((f) => f.field in LOOK_FIELDS);
	if (look.length)
		plan.push(`look: ${look.map((f) => `${LOOK_FIELDS[f.field]} ${show(f.before)} → ${show(f.after)}`).join(', ')}`);

	if (touched('state'))
		progress.push(
			`marked ${STATE_WORDS[String(after.state)] ?? String(after.state)} (was ${STATE_WORDS[String(before.state)] ?? String(before.state)})`
		);
	if (touched('notes')) progress.push(after.notes ? `note now reads ${quoted(after.notes)}` : 'note cleared');
	return { plan, progress };
}

function show(v: JsonValue): string {
	return v === null || v === '' ? 'none' : String(v);
}

function fixtureSummary(f: SnapshotFixture, ctx: DescribeContext): string {
	const m = modeText(f.modeId, ctx);
	return `${typeText(f.modeId, ctx)} ${m.text}, ${whereText(f.control as FixtureControl | undefined, ctx)}`;
}

function recordName(kind: 'universe' | 'type' | 'receiver', r: SnapshotRecord): string {
	if (kind === 'universe') return `Universe ${r.number ?? ''}${r.name ? ` ${r.name}` : ''}`;
	if (kind === 'type') return `Type ${[r.maker, r.model].filter(Boolean).join(' ')}`;
	return `Receiver ${r.name ?? ''}`;
}

const TRANSPORT_WORDS: Record<string, string> = {
	'dmx-wired': 'Wired DMX',
	'dmx-wireless': 'Wireless DMX',
	sacn: 'sACN',
	artnet: 'Art-Net'
};

function recordPhrases(kind: 'universe' | 'type' | 'receiver', fields: readonly FieldChange[]): string[] {
	const out: string[] = [];
	const seen = new Set<string>();
	for (const f of fields) {
		const top = f.field.split('.')[0];
		if (seen.has(top)) continue;
		seen.add(top);
		if (top === 'transport')
			out.push(
				`now ${TRANSPORT_WORDS[String(f.after)] ?? String(f.after)} (was ${TRANSPORT_WORDS[String(f.before)] ?? String(f.before)})`
			);
		else if (top === 'number') out.push(`renumbered from ${show(f.before)} to ${show(f.after)}`);
		else if (top === 'name' || top === 'maker' || top === 'model')
			out.push(`${top} ${quoted(f.before)} → ${quoted(f.after)}`);
		else if (top === 'modes') out.push('modes or channels changed');
		else if (top === 'channelCount') out.push(`${show(f.before)} → ${show(f.after)} channels`);
		else if (top === 'protocol')
			out.push(`protocol ${String(f.before).toUpperCase()} → ${String(f.after).toUpperCase()}`);
		else if (top === 'labels') out.push('channel names changed');
		else if (top === 'notes' || top === 'transmitterNotes') out.push('notes changed');
	}
	if (kind === 'type' && out.length === 0 && fields.length) out.push('details changed');
	return out;
}

/** Every change between two snapshots as sentences, split into plan changes and on-set progress. */
export function describeChanges(
	diff: Pick<PatchDiff, 'added' | 'removed' | 'changed'> &
		Partial<Pick<PatchDiff, 'universes' | 'types' | 'receivers'>>,
	before: DescribeSnapshot,
	after: DescribeSnapshot
): DescribedChanges {
	const cb = describeContext(before);
	const ca = describeContext(after);
	const plan: ChangeLine[] = [];
	const progress: ChangeLine[] = [];

	const collections = [
		['universe', diff.universes, before.universes, after.universes],
		['receiver', diff.receivers, before.receivers, after.receivers],
		['type', diff.types, before.types, after.types]
	] as const;
	for (const [kind, d, was, now] of collections) {
		if (!d) continue;
		for (const r of d.added)
			plan.push({
				group: 'plan',
				kind: 'added',
				fixture: null,
				text: `${recordName(kind, r)} added${kind === 'universe' && r.transport ? ` (${TRANSPORT_WORDS[String(r.transport)] ?? ''})` : ''}`
			});
		for (const r of d.removed)
			plan.push({ group: 'plan', kind: 'removed', fixture: null, text: `${recordName(kind, r)} removed` });
		for (const c of d.changed) {
			const r = now?.find((x) => x.id === c.id) ?? was?.find((x) => x.id === c.id);
			const phrases = recordPhrases(kind, c.fields);
			if (r && phrases.length)
				plan.push({
					group: 'plan',
					kind: 'changed',
					fixture: null,
					text: `${recordName(kind, r)}: ${phrases.join('; ')}`
				});
		}
	}

	for (const f of diff.added)
		plan.push({
			group: 'plan',
			kind: 'added',
			fixture: f.number,
			text: `${fixtureName(f)} added: ${fixtureSummary(f, ca)}`
		});
	for (const f of diff.removed)
		plan.push({
			group: 'plan',
			kind: 'removed',
			fixture: f.number,
			text: `${fixtureName(f)} removed (was ${fixtureSummary(f, cb)})`
		});

	const beforeById = new Map(before.fixtures.map((f) => [f.id, f]));
	const beforeByNumber = new Map(before.fixtures.map((f) => [f.number, f]));
	const afterById = new Map(after.fixtures.map((f) => [f.id, f]));
	for (const c of diff.changed) {
		const a = afterById.get(c.fixtureId);
		if (!a) continue;
		// Matched by id, or re-created under the same number (diff.ts matches the same way).
		const b = beforeById.get(c.fixtureId) ?? beforeByNumber.get(c.number);
		if (!b) continue;
		const p = fixturePhrases(b, a, c.fields, cb, ca);
		const name = fixtureName(a);
		if (p.plan.length)
			plan.push({ group: 'plan', kind: 'changed', fixture: a.number, text: `${name} ${p.plan.join('; ')}` });
		if (p.progress.length)
			progress.push({
				group: 'progress',
				kind: 'changed',
				fixture: a.number,
				text: `${name} ${p.progress.join('; ')}`
			});
	}
	return { plan, progress };
}

const isRecord = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

/** One audit entry about a fixture in words ("marked checked (was hung)"), read against the current rig. */
export function historyText(action: string, before: unknown, after: unknown, ctx: DescribeContext): string {
	switch (action) {
		case 'fixture.create':
			return 'added the fixture';
		case 'fixture.import':
			return 'added the fixture by CSV import';
		case 'fixture.delete':
			return 'removed the fixture';
		case 'photo.add':
			return 'added a photo';
		case 'photo.delete':
			return 'removed a photo';
		case 'fixture.autopatch': {
			const was = isRecord(before) ? whereText(before.control as FixtureControl, ctx) : '?';
			const now = isRecord(after) ? whereText(after.control as FixtureControl, ctx) : '?';
			return `auto-addressed: moved from ${was} to ${now}`;
		}
		case 'fixture.update': {
			if (!isRecord(before) || !isRecord(after)) return 'changed the fixture';
			const b = before as unknown as SnapshotFixture;
			const a = after as unknown as SnapshotFixture;
			const p = fixturePhrases(b, a, diffFields(b, a), ctx, ctx);
			const all = [...p.progress, ...p.plan];
			return all.length ? all.join('; ') : 'saved it unchanged';
		}
		default:
			return action.replace('.', ' ');
	}
}
