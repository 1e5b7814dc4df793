import { modeSlotCount, type Bits, type ModeChannel } from '$lib/patch';
import type { TypeShape } from '$lib/shapes';

// A fixture type being written or edited, as a rune class so its rules are tested without a
// browser (tests/unit/types/type-draft.test.ts). Fields are strings while typed; `body()` turns
// them into the API's shape (typeCreate / typePatch), keeping what the form does not show
// (GDTF DMX ranges, breaks, fine-byte offsets, a mode's power data) untouched.

export const BIT_DEPTHS: Bits[] = [8, 16, 24, 32];

/** Fields of a channel the form does not edit; they travel through a save unchanged. */
type Hidden = Pick<ModeChannel, 'dmxFrom' | 'dmxTo' | 'dmxBreak' | 'fineOffsets'>;

export interface DraftChannel {
	offset: string;
	parameter: string;
	bits: Bits;
	default: string;
	min: string;
	max: string;
	unit: string;
	hidden: Hidden;
}

export interface DraftMode {
	/** the saved mode's id; absent for a mode added in this draft */
	id?: number;
	name: string;
	channels: DraftChannel[];
	watts: number | null;
	inputVolts: { min: number; max: number } | null;
}

const str = (v: number | null | undefined) => (v == null ? '' : String(v));
const num = (s: string) => (s.trim() === '' ? undefined : Number(s.trim()));

function channelFrom(c: ModeChannel): DraftChannel {
	const hidden: Hidden = {};
	if (c.dmxFrom !== undefined) hidden.dmxFrom = c.dmxFrom;
	if (c.dmxTo !== undefined) hidden.dmxTo = c.dmxTo;
	if (c.dmxBreak !== undefined) hidden.dmxBreak = c.dmxBreak;
	if (c.fineOffsets !== undefined) hidden.fineOffsets = [...c.fineOffsets];
	return {
		offset: str(c.offset),
		parameter: c.parameter,
		bits: c.bits,
		default: str(c.default),
		min: str(c.min),
		max: str(c.max),
		unit: c.unit ?? '',
		hidden
	};
}

function channelOut(c: DraftChannel) {
	const min = num(c.min);
	const max = num(c.max);
	return {
		offset: num(c.offset) ?? null,
		parameter: c.parameter.trim(),
		bits: c.bits,
		default: num(c.default) ?? 0,
		...(min !== undefined ? { min } : {}),
		...(max !== undefined ? { max } : {}),
		...(c.unit.trim() ? { unit: c.unit.trim() } : {}),
		...c.hidden
	};
}

export function blankChannel(offset: number | null, parameter = 'intensity'): DraftChannel {
	return { offset: str(offset), parameter, bits: 8, default: '0', min: '', max: '', unit: '', hidden: {} };
}

/** How many slots a channel's bytes take (8-bit 1, 16-bit 2 …), per ANSI E1.11 one byte per slot. */
const width = (bits: Bits) => bits / 8;

export class TypeDraft {
	id = $state<number | undefined>(undefined);
	version = $state<number | undefined>(undefined);
	maker = $state('');
	model = $state('');
	notes = $state('');
	/** share of full draw at zero intensity, shown as a percent; '' leaves it as saved */
	drawFloor = $state('');
	modes = $state<DraftMode[]>([]);

	constructor(type?: TypeShape) {
		if (type) this.load(type);
		else this.clear();
	}

	/** An empty new type: one unnamed mode with one channel on slot 1. */
	clear(): void {
		this.id = this.version = undefined;
		this.maker = this.model = this.notes = this.drawFloor = '';
		this.modes = [{ name: '', channels: [blankChannel(1)], watts: null, inputVolts: null }];
	}

	load(type: TypeShape): void {
		this.id = type.id;
		this.version = type.version;
		this.maker = type.maker;
		this.model = type.model;
		this.notes = type.notes;
		this.drawFloor = type.drawFloor === undefined ? '' : String(Math.round(type.drawFloor * 1000) / 10);
		this.modes = type.modes.map((m) => ({
			id: m.id,
			name: m.name,
			channels: m.channels.map(channelFrom),
			watts: m.watts ?? null,
			inputVolts: m.inputVolts ?? null
		}));
	}

	/** Fills a new type from a library entry (no ids, nothing saved). */
	fill(t: { maker: string; model: string; notes: string; modes: { name: string; channels: ModeChannel[] }[] }) {
		this.maker = t.maker;
		this.model = t.model;
		this.notes = t.notes;
		this.modes = t.modes.map((m) => ({
			name: m.name,
			channels: m.channels.map(channelFrom),
			watts: null,
			inputVolts: null
		}));
	}

	/** A mode's slot count by the engine's rule, or a sentence when an offset cannot be read. */
	slots(mi: number): number | string {
		const m = this.modes[mi];
		const channels = m.channels.map(channelOut);
		if (channels.some((c) => c.offset !== null && (!Number.isInteger(c.offset) || c.offset < 1)))
			return 'Offsets are whole numbers from 1.';
		return modeSlotCount({ id: 0, name: m.name, channels });
	}

	/**
	 * Which parameter each slot of break 1 carries (index 0 = slot 1), '' for a gap, so the page
	 * draws the layout as it is typed. Fine bytes are marked with a trailing "·fine".
	 */
	layout(mi: number): string[] {
		const n = this.slots(mi);
		if (typeof n === 'string') return [];
		const out: string[] = Array.from({ length: n }, () => '');
		for (const c of this.modes[mi].channels.map(channelOut)) {
			if (c.offset === null || (c.dmxBreak ?? 1) !== 1) continue;
			const slots = c.fineOffsets?.length
				? [c.offset, ...c.fineOffsets]
				: Array.from({ length: width(c.bits) }, (_, i) => c.offset! + i);
			slots.forEach((s, i) => {
				if (s >= 1 && s <= n)
					out[s - 1] = out[s - 1] ? `${out[s - 1]} + ${c.parameter}` : i === 0 ? c.parameter : `${c.parameter}·fine`;
			});
		}
		return out;
	}

	addMode(): void {
		this.modes.push({ name: '', channels: [blankChannel(1)], watts: null, inputVolts: null });
	}

	/** A copy beside the original, unsaved, named so the two can be told apart. */
	duplicateMode(mi: number): void {
		const m = this.modes[mi];
		const names = this.modes.map((x) => x.name);
		let name = `${m.name} copy`;
		for (let i = 2; names.includes(name); i++) name = `${m.name} copy ${i}`;
		const copy: DraftMode = {
			name,
			channels: m.channels.map((c) => ({ ...c, hidden: { ...c.hidden } })),
			watts: m.watts,
			inputVolts: m.inputVolts ? { ...m.inputVolts } : null
		};
		this.modes.splice(mi + 1, 0, copy);
	}

	removeMode(mi: number): void {
		this.modes.splice(mi, 1);
	}

	/** A new channel on the first slot after the footprint, with a parameter not yet used in the mode. */
	addChannel(mi: number): void {
		const m = this.modes[mi];
		const n = this.slots(mi);
		const used = m.channels.map((c) => c.parameter.trim());
		let parameter = 'intensity';
		for (let i = 2; used.includes(parameter); i++) parameter = `parameter ${i}`;
		m.channels.push(blankChannel(typeof n === 'number' ? n + 1 : null, parameter));
	}

	removeChannel(mi: number, ci: number): void {
		this.modes[mi].channels.splice(ci, 1);
	}

	/**
	 * Moves a channel one place up (-1) or down (+1). When both neighbours sit on slots of the same
	 * break with adjacent bytes, they trade places in the slot layout too: the earlier one starts
	 * where the pair started and the other follows it, so the footprint keeps its length.
	 */
	moveChannel(mi: number, ci: number, delta: -1 | 1): void {
		const list = this.modes[mi].channels;
		const cj = ci + delta;
		if (cj < 0 || cj >= list.length) return;
		const [first, second] = delta < 0 ? [list[cj], list[ci]] : [list[ci], list[cj]];
		const a = num(first.offset);
		const b = num(second.offset);
		const laid =
			a !== undefined &&
			b !== undefined &&
			Number.isInteger(a) &&
			Number.isInteger(b) &&
			!first.hidden.fineOffsets?.length &&
			!second.hidden.fineOffsets?.length &&
			(first.hidden.dmxBreak ?? 1) === (second.hidden.dmxBreak ?? 1) &&
			a + width(first.bits) === b;
		if (laid) {
			second.offset = String(a);
			first.offset = String(a + width(second.bits));
		}
		const lo = Math.min(ci, cj);
		list.splice(lo, 2, list[lo + 1], list[lo]);
	}

	/** The API body: typeCreate for a new type, typePatch (with the version read) for a saved one. */
	body(): Record<string, unknown> {
		const floor = num(this.drawFloor);
		return {
			maker: this.maker.trim(),
			model: this.model.trim(),
			notes: this.notes,
			...(floor !== undefined ? { drawFloor: Number.isFinite(floor) ? floor / 100 : floor } : {}),
			modes: this.modes.map((m) => ({
				...(m.id !== undefined ? { id: m.id } : {}),
				name: m.name.trim(),
				channels: m.channels.map(channelOut),
				...(m.watts !== null ? { watts: m.watts } : {}),
				...(m.inputVolts !== null ? { inputVolts: m.inputVolts } : {})
			})),
			...(this.version !== undefined ? { version: this.version } : {})
		};
	}
}
