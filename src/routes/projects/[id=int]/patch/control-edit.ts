import {
	autoAddress,
	breakFootprints,
	channelOffsets,
	compileMode,
	modeSlotCount,
	type FixtureControl,
	type Mode
} from '$lib/patch';
import { parseAddressText } from '$lib/address-text';
import type { PatchData } from '$lib/shapes';

// The control drawer's rules, pure so they are unit-tested without a browser
// (tests/unit/patch-table/control-edit.test.ts): what the form starts from, the body it sends,
// and the sentences that refuse it. The server checks the same again (db/fixtures.ts).

type Fx = PatchData['fixtures'][number];
export type Kind = FixtureControl['kind'];
export const KINDS: { kind: Kind; label: string }[] = [
	{ kind: 'dmx', label: 'DMX' },
	{ kind: 'dmx-map', label: 'Address per parameter' },
	{ kind: 'rc', label: 'RC radio' },
	{ kind: 'follow', label: 'Follow a leader' },
	{ kind: 'manual', label: 'Manual' }
];

export interface ControlForm {
	kind: Kind;
	/** universe number as typed, for dmx and dmx-map */
	universe: string;
	/** "101", or "2.101" which also sets the universe */
	address: string;
	/** breaks 2…n of a multi-break mode */
	breaks: { dmxBreak: number; slots: number; universe: string; address: string }[];
	/** dmx-map: parameter → address text */
	map: Record<string, string>;
	receiverId: string;
	/** rc: parameter → channel text */
	channels: Record<string, string>;
	/** follow: the leader's fixture number as typed */
	leader: string;
}

export function modeOf(p: PatchData, f: Pick<Fx, 'typeId' | 'modeId'>): (Mode & { slots?: number }) | undefined {
	return p.types.find((t) => t.id === f.typeId)?.modes.find((m) => m.id === f.modeId);
}

/** The mode's parameters that take a slot, first of each name (what a dmx-map addresses). */
export function mappedParameters(mode: Mode | undefined): { parameter: string; bytes: number }[] {
	return mode ? compileMode(mode).mapped : [];
}

/** Every parameter of the mode, once each (what an RC receiver drives). */
export function parametersOf(mode: Mode | undefined): string[] {
	return [...new Set((mode?.channels ?? []).map((c) => c.parameter))];
}

export function formFor(p: PatchData, f: Fx): ControlForm {
	const uNumber = (id: number | null) => (id == null ? '' : String(p.universes.find((u) => u.id === id)?.number ?? ''));
	const c = f.control;
	const mode = modeOf(p, f);
	const firstUniverse = p.universes[0] ? String(p.universes[0].number) : '';
	const form: ControlForm = {
		kind: c.kind,
		universe: firstUniverse,
		address: '',
		breaks: mode
			? breakFootprints(mode)
					.filter((b) => b.dmxBreak !== 1)
					.map((b) => ({ ...b, universe: firstUniverse, address: '' }))
			: [],
		map: Object.fromEntries(mappedParameters(mode).map((m) => [m.parameter, ''])),
		receiverId: p.receivers[0] ? String(p.receivers[0].id) : '',
		channels: Object.fromEntries(parametersOf(mode).map((x) => [x, ''])),
		leader: ''
	};
	if (c.kind === 'dmx') {
		form.universe = uNumber(c.universeId);
		form.address = String(c.address);
		for (const b of c.breaks ?? []) {
			const row = form.breaks.find((x) => x.dmxBreak === b.dmxBreak);
			if (row) Object.assign(row, { universe: uNumber(b.universeId), address: String(b.address) });
		}
	} else if (c.kind === 'dmx-map') {
		form.universe = uNumber(c.universeId);
		for (const [k, v] of Object.entries(c.addresses)) if (k in form.map) form.map[k] = String(v);
	} else if (c.kind === 'rc') {
		form.receiverId = c.receiverId == null ? '' : String(c.receiverId);
		for (const [k, v] of Object.entries(c.channels)) if (k in form.channels) form.channels[k] = String(v);
	} else if (c.kind === 'follow') {
		form.leader = String(p.fixtures.find((x) => x.id === c.leaderId)?.number ?? '');
	}
	return form;
}

export type Built = { ok: true; control: FixtureControl } | { ok: false; errors: Record<string, string> };

function universeIdOf(p: PatchData, text: string): number | string {
	const t = text.trim();
	if (!t) return 'Choose a universe.';
	const u = p.universes.find((x) => String(x.number) === t);
	return u ? u.id : `There is no universe ${t} in this project; add it under Universes first.`;
}

function slotOf(text: string): number | string {
	const t = text.trim();
	if (!/^\d+$/.test(t)) return t ? `“${t}” is not an address: write a number 1–512.` : 'Write an address, 1–512.';
	const n = Number(t);
	return n >= 1 && n <= 512 ? n : `Address ${n} is outside 1–512 (a DMX universe has 512 slots).`;
}

/** The control the form describes, or a sentence per field saying why it cannot be sent. */
export function buildControl(p: PatchData, f: Fx, form: ControlForm): Built {
	const errors: Record<string, string> = {};
	switch (form.kind) {
		case 'manual':
			return { ok: true, control: { kind: 'manual' } };
		case 'dmx': {
			let universeText = form.universe;
			let address: number | string;
			const parsed = parseAddressText(form.address);
			if (!parsed.ok) address = form.address.trim() ? parsed.message : 'Write an address, 1–512, or 2.101.';
			else {
				address = parsed.address;
				if (parsed.universe !== null) universeText = String(parsed.universe);
			}
			const universeId = universeIdOf(p, universeText);
			if (typeof universeId === 'string') errors.universe = universeId;
			if (typeof address === 'string') errors.address = address;
			const mode = modeOf(p, f);
			if (mode && typeof address === 'number') {
				const slots = modeSlotCount(mode);
				if (address + slots - 1 > 512)
					errors.address = `Mode “${mode.name}” needs ${slots} slots; from ${address} it would run to ${address + slots - 1}, past 512. The last start that fits is ${513 - slots}.`;
			}
			const breaks = form.breaks.map((b) => {
				const u = universeIdOf(p, b.universe);
				const a = slotOf(b.address);
				if (typeof u === 'string') errors[`break-${b.dmxBreak}-universe`] = u;
				if (typeof a === 'string') errors[`break-${b.dmxBreak}-address`] = a;
				else if (a + b.slots - 1 > 512)
					errors[`break-${b.dmxBreak}-address`] =
						`Break ${b.dmxBreak} needs ${b.slots} slots; the last start that fits is ${513 - b.slots}.`;
				return { dmxBreak: b.dmxBreak, universeId: u as number, address: a as number };
			});
			if (Object.keys(errors).length) return { ok: false, errors };
			return {
				ok: true,
				control: {
					kind: 'dmx',
					universeId: universeId as number,
					address: address as number,
					...(breaks.length ? { breaks } : {})
				}
			};
		}
		case 'dmx-map': {
			const universeId = universeIdOf(p, form.universe);
			if (typeof universeId === 'string') errors.universe = universeId;
			const addresses: Record<string, number> = {};
			const mapped = mappedParameters(modeOf(p, f));
			if (!mapped.length) errors.map = 'This mode has no channel that takes a slot.';
			for (const { parameter, bytes } of mapped) {
				const a = slotOf(form.map[parameter] ?? '');
				if (typeof a === 'string') errors[`map-${parameter}`] = a;
				else if (a + bytes - 1 > 512)
					errors[`map-${parameter}`] = `${parameter} is 16-bit and needs ${a} and ${a + 1}.`;
				else addresses[parameter] = a;
			}
			const taken = new Map<number, string>();
			for (const { parameter, bytes } of mapped) {
				const a = addresses[parameter];
				if (a === undefined) continue;
				for (let s = a; s < a + bytes; s++) {
					const other = taken.get(s);
					if (other) errors[`map-${parameter}`] = `Slot ${s} is already given to ${other}.`;
					taken.set(s, parameter);
				}
			}
			if (Object.keys(errors).length) return { ok: false, errors };
			return { ok: true, control: { kind: 'dmx-map', universeId: universeId as number, addresses } };
		}
		case 'rc': {
			const r = p.receivers.find((x) => String(x.id) === form.receiverId);
			if (!r) errors.receiverId = p.receivers.length ? 'Choose a receiver.' : 'Add a receiver on the Radio page first.';
			const channels: Record<string, number> = {};
			for (const [parameter, text] of Object.entries(form.channels)) {
				const t = text.trim();
				if (!t) continue;
				const n = Number(t);
				if (!Number.isInteger(n) || n < 1 || (r && n > r.channelCount))
					errors[`rc-${parameter}`] = r ? `Receiver “${r.name}” has channels 1–${r.channelCount}.` : 'Not a channel.';
				else channels[parameter] = n;
			}
			if (Object.keys(errors).length) return { ok: false, errors };
			return { ok: true, control: { kind: 'rc', receiverId: r!.id, channels } };
		}
		case 'follow': {
			const problem = followProblem(p, f, form.leader);
			if (typeof problem === 'string') return { ok: false, errors: { leader: problem } };
			return { ok: true, control: { kind: 'follow', leaderId: problem } };
		}
	}
}

/** The leader's id, or the sentence that refuses it (self, a follower, a chain or a cycle). */
export function followProblem(p: PatchData, f: Pick<Fx, 'id' | 'number'>, leaderText: string): number | string {
	const t = leaderText.trim().replace(/^#/, '');
	if (!t) return 'Write the number of the fixture to follow.';
	const leader = p.fixtures.find((x) => String(x.number) === t);
	if (!leader) return `There is no fixture ${t} in this project.`;
	if (leader.id === f.id) return 'A fixture cannot follow itself.';
	if (leader.control.kind === 'follow') {
		const next = p.fixtures.find((x) => leader.control.kind === 'follow' && x.id === leader.control.leaderId);
		if (next?.id === f.id)
			return `Fixture ${leader.number} follows this one; following it back would make a loop with no leader.`;
		return `Fixture ${leader.number} follows ${next?.number ?? 'another fixture'} itself; follow ${next?.number ?? 'its leader'} instead.`;
	}
	const mine = p.fixtures.filter((x) => x.control.kind === 'follow' && x.control.leaderId === f.id);
	if (mine.length)
		return `Fixture${mine.length === 1 ? '' : 's'} ${mine.map((x) => x.number).join(', ')} follow${mine.length === 1 ? 's' : ''} this one; a leader cannot follow. Move ${mine.length === 1 ? 'it' : 'them'} first.`;
	return leader.id;
}

/** Slots of `universeId` that other fixtures claim (dmx, dmx-map and every break). */
export function usedSlots(p: PatchData, universeId: number, exceptId: number | null): Set<number> {
	const used = new Set<number>();
	for (const f of p.fixtures) {
		if (f.id === exceptId) continue;
		const c = f.control;
		if ((c.kind === 'dmx' || c.kind === 'dmx-map') && c.universeId === universeId)
			for (const r of f.slots) for (let s = r.start; s <= r.end; s++) used.add(s);
		for (const b of f.breakSlots ?? [])
			if (b.universeId === universeId) for (const r of b.ranges) for (let s = r.start; s <= r.end; s++) used.add(s);
	}
	return used;
}

/** A suggestion per mapped parameter: free slots in channel order, a 16-bit one on two free neighbours. */
export function suggestMap(
	p: PatchData,
	f: Fx,
	universeId: number,
	keep: Record<string, string> = {}
): Record<string, number | null> {
	const used = usedSlots(p, universeId, f.id);
	for (const v of Object.values(keep)) if (/^\d+$/.test(v.trim())) used.add(Number(v));
	const out: Record<string, number | null> = {};
	let s = 1;
	for (const { parameter, bytes } of mappedParameters(modeOf(p, f))) {
		if (/^\d+$/.test((keep[parameter] ?? '').trim())) continue;
		while (s + bytes - 1 <= 512 && [...Array(bytes).keys()].some((i) => used.has(s + i))) s++;
		if (s + bytes - 1 > 512) {
			out[parameter] = null;
			continue;
		}
		out[parameter] = s;
		for (let i = 0; i < bytes; i++) used.add(s + i);
		s += bytes;
	}
	return out;
}

/** For each parameter given a channel: who else drives that channel of the receiver with another parameter. */
export function rcClashes(p: PatchData, f: Fx, receiverId: number, channels: Record<string, string>) {
	const out: Record<string, string> = {};
	const mine = Object.entries(channels).filter(([, v]) => /^\d+$/.test(v.trim()));
	for (const [parameter, text] of mine) {
		const ch = Number(text);
		const who: string[] = [];
		for (const [other, t] of mine) if (other !== parameter && Number(t) === ch) who.push(`${other} of this fixture`);
		for (const o of p.fixtures) {
			if (o.id === f.id || o.control.kind !== 'rc' || o.control.receiverId !== receiverId) continue;
			// a link group shares its channels on purpose
			const sameGroup = f.linkGroup !== null && o.linkGroup === f.linkGroup;
			for (const [op, oc] of Object.entries(o.control.channels))
				if (oc === ch && !(sameGroup && op === parameter)) who.push(`${op} of fixture ${o.number}`);
		}
		if (who.length) out[parameter] = `Channel ${ch} already drives ${who.join(', ')}.`;
	}
	return out;
}

/** The lowest channels of the receiver no other fixture uses, one per parameter still empty. */
export function suggestRc(p: PatchData, f: Fx, receiverId: number, channels: Record<string, string>) {
	const r = p.receivers.find((x) => x.id === receiverId);
	const used = new Set<number>();
	for (const o of p.fixtures)
		if (o.id !== f.id && o.control.kind === 'rc' && o.control.receiverId === receiverId)
			for (const c of Object.values(o.control.channels)) used.add(c);
	for (const v of Object.values(channels)) if (/^\d+$/.test(v.trim())) used.add(Number(v));
	const out: Record<string, string> = { ...channels };
	let ch = 1;
	for (const [parameter, v] of Object.entries(channels)) {
		if (v.trim()) continue;
		while (used.has(ch)) ch++;
		if (r && ch > r.channelCount) break;
		out[parameter] = String(ch);
		used.add(ch++);
	}
	return out;
}

/** Where a fixture's DMX footprint fits without touching anyone else: from its own address on, then from 1. */
export function nextFreeAddress(p: PatchData, f: Fx): { universeId: number; address: number; slots: number } | null {
	const c = f.control;
	if (c.kind !== 'dmx' || c.universeId == null) return null;
	const mode = modeOf(p, f);
	if (!mode) return null;
	const slots = modeSlotCount(mode);
	const used = usedSlots(p, c.universeId, f.id);
	const occupied = [...used].map((s) => ({ start: s, end: s }));
	for (const start of [Math.min(c.address, 512), 1]) {
		const r = autoAddress({ fixtures: [{ id: f.id, number: f.number, slots }], occupied, start });
		const at = r.placed[0]?.address;
		if (at !== undefined && at !== c.address) return { universeId: c.universeId, address: at, slots };
	}
	return null;
}

/** Why these fixtures cannot form a link group, or null: one type and mode, one universe and address. */
export function linkProblem(p: PatchData, list: Fx[]): string | null {
	if (list.length < 2) return 'Choose at least two fixtures to link.';
	const [first, ...rest] = list;
	const where = (f: Fx) => {
		const c = f.control;
		if (c.kind !== 'dmx') return null;
		const u = p.universes.find((x) => x.id === c.universeId)?.number ?? '?';
		return `${u}.${c.address}`;
	};
	for (const f of rest) {
		if (f.modeId !== first.modeId)
			return `Fixture ${f.number} runs another mode than ${first.number}; linked units share one mode. Change the mode first.`;
	}
	for (const f of list)
		if (f.control.kind !== 'dmx')
			return `Fixture ${f.number} is not on a DMX address (${f.control.kind}); linked units share one universe and address.`;
	for (const f of rest)
		if (where(f) !== where(first))
			return `Fixture ${f.number} is at ${where(f)} and ${first.number} at ${where(first)}; linked units share one universe and address.`;
	return null;
}

/** A group name nobody uses yet: LINK-1, LINK-2 … */
export function freshGroupName(p: PatchData): string {
	const used = new Set(p.fixtures.map((f) => f.linkGroup).filter(Boolean));
	let n = 1;
	while (used.has(`LINK-${n}`)) n++;
	return `LINK-${n}`;
}

/** Slots one dmx-map parameter takes, for the preview beside its field. */
export function paramSlotsText(p: PatchData, f: Fx, parameter: string, address: number): string {
	const ch = modeOf(p, f)?.channels.find((c) => c.parameter === parameter && c.offset !== null);
	const n = ch ? channelOffsets(ch).length : 1;
	return n > 1 ? `${address}–${address + n - 1}` : String(address);
}
