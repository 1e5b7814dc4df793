import { own } from './footprint';
import type { RcProtocol } from './types';

// Channel pools per protocol. SBUS: 16 proportional channels of 11 bits plus 2 digital ones
// (17, 18) in the flags byte (common practice, as documented by the open flight-controller
// projects). CRSF as used on ELRS/Crossfire links carries 16; PPM commonly 8.
export const RC_CHANNEL_POOLS: Record<RcProtocol, { proportional: number; digital: number }> = {
	sbus: { proportional: 16, digital: 2 },
	crsf: { proportional: 16, digital: 0 },
	ppm: { proportional: 8, digital: 0 }
};

export function defaultChannelCount(protocol: RcProtocol): number {
	const p = RC_CHANNEL_POOLS[protocol];
	return p.proportional + p.digital;
}

export interface RcReceiverInput {
	id: number;
	protocol: RcProtocol;
	/** Channels wired out of the receiver; defaults to the protocol's full count. */
	channelCount?: number;
	name?: string;
}

export interface RcFixtureInput {
	id: number;
	number: number;
	linkGroup: string | null;
	parameters: readonly string[];
	/** Channels already set on the unit. */
	channels?: Readonly<Record<string, number>>;
	/** Parameters that are on/off only and may use SBUS digital channels 17–18. */
	digital?: readonly string[];
}

export interface AssignRcInput {
	receiver: RcReceiverInput;
	fixtures: readonly RcFixtureInput[];
	/** Keep every valid existing channel and assign only what is missing (default: reassign all). */
	keepExisting?: boolean;
}

export interface RcAssigned {
	fixtureId: number;
	parameter: string;
	channel: number;
}

export interface RcUnassigned {
	fixtureId: number;
	parameter: string;
	reason: string;
}

export interface AssignRcResult {
	assigned: RcAssigned[];
	unassigned: RcUnassigned[];
}

/**
 * SBUS digital channels only carry on/off, so 17–18 stay out of the proportional pool and go to
 * parameters flagged `digital` or named like a switch. Anything dimmable gets a proportional one.
 */
export function isDigitalParameter(fixture: RcFixtureInput, parameter: string): boolean {
	return (fixture.digital ?? []).includes(parameter) || /switch/i.test(parameter);
}

interface Unit {
	members: RcFixtureInput[];
	parameters: string[];
	digital: Set<string>;
	channel: Map<string, number>;
	label: string;
}

function unitsOf(fixtures: readonly RcFixtureInput[]): Unit[] {
	const sorted = [...fixtures].sort((a, b) => a.number - b.number || a.id - b.id);
	const byGroup = new Map<string, Unit>();
	const units: Unit[] = [];
	for (const f of sorted) {
		let unit = f.linkGroup === null ? undefined : byGroup.get(f.linkGroup);
		if (unit === undefined) {
			unit = { members: [], parameters: [], digital: new Set(), channel: new Map(), label: '' };
			units.push(unit);
			if (f.linkGroup !== null) byGroup.set(f.linkGroup, unit);
		}
		unit.members.push(f);
		for (const p of f.parameters) {
			if (!unit.parameters.includes(p)) unit.parameters.push(p);
			if (isDigitalParameter(f, p)) unit.digital.add(p);
		}
	}
	for (const u of units) {
		const nums = u.members.map((m) => m.number).join(', ');
		const group = u.members[0].linkGroup;
		u.label = group === null ? `fixture ${nums}` : `link group "${group}" (fixtures ${nums})`;
	}
	return units;
}

/**
 * One channel per parameter for each RC fixture, in fixture-number order. A link group takes its
 * channels once and every member gets the same map; a unit's new proportional channels form one
 * block of adjacent free channels, so its controls sit together on the transmitter. A unit that
 * finds no such block is reported, never split or dropped.
 */
export function assignRc(input: AssignRcInput): AssignRcResult {
	const { receiver } = input;
	const pool = RC_CHANNEL_POOLS[receiver.protocol];
	const count = receiver.channelCount ?? defaultChannelCount(receiver.protocol);
	const lastProportional = Math.min(pool.proportional, count);
	const digitalChannels: number[] = [];
	for (let ch = pool.proportional + 1; ch <= Math.min(pool.proportional + pool.digital, count); ch++)
		digitalChannels.push(ch);
	const used = new Uint8Array(Math.max(count, 0) + 1);
	const units = unitsOf(input.fixtures);
	const name =
		receiver.name !== undefined && receiver.name !== '' ? `receiver "${receiver.name}"` : `receiver ${receiver.id}`;

	// Existing channels are claimed before anything new, so a later unit keeps its channel.
	if (input.keepExisting === true) {
		for (const unit of units) {
			for (const p of unit.parameters) {
				for (const m of unit.members) {
					const ch = m.channels === undefined ? undefined : own(m.channels, p);
					if (ch === undefined || !Number.isInteger(ch) || ch < 1 || ch > count || used[ch] === 1) continue;
					used[ch] = 1;
					unit.channel.set(p, ch);
					break;
				}
			}
		}
	}

	const failed = new Map<Unit, string>();
	for (const unit of units) {
		const missing = unit.parameters.filter((p) => !unit.channel.has(p));
		const needBlock: string[] = [];
		for (const p of missing) {
			const d = unit.digital.has(p) ? digitalChannels.find((ch) => used[ch] === 0) : undefined;
			if (d === undefined) needBlock.push(p);
			else {
				used[d] = 1;
				unit.channel.set(p, d);
			}
		}
		if (needBlock.length === 0) continue;
		const k = needBlock.length;
		let run = 0;
		let blockStart = -1;
		let free = 0;
		let largest = 0;
		for (let ch = 1; ch <= lastProportional; ch++) {
			if (used[ch] === 0) {
				free++;
				run++;
				largest = Math.max(largest, run);
				if (run === k && blockStart < 0) blockStart = ch - k + 1;
			} else run = 0;
		}
		if (blockStart < 0) {
			failed.set(
				unit,
				`${unit.label} needs ${k} adjacent free ${k === 1 ? 'channel' : 'channels'}; ${name} has ${free} free of channels 1–${lastProportional}${free > 0 ? ` (largest block ${largest})` : ' — it is full'}`
			);
			continue;
		}
		needBlock.forEach((p, i) => {
			used[blockStart + i] = 1;
			unit.channel.set(p, blockStart + i);
		});
	}

	const result: AssignRcResult = { assigned: [], unassigned: [] };
	const members = units.flatMap((unit) => unit.members.map((m) => ({ unit, m })));
	members.sort((a, b) => a.m.number - b.m.number || a.m.id - b.m.id);
	for (const { unit, m } of members) {
		{
			for (const p of new Set(m.parameters)) {
				const ch = unit.channel.get(p);
				if (ch !== undefined) result.assigned.push({ fixtureId: m.id, parameter: p, channel: ch });
				else
					result.unassigned.push({ fixtureId: m.id, parameter: p, reason: failed.get(unit) ?? `no channel for ${p}` });
			}
		}
	}
	return result;
}
