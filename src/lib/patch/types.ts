// Engine input shapes: the DESIGN.md "Shapes" in camelCase, narrowed to what the engine reads.

// GDTF DMXChannel Offset lists any number of bytes; 32-bit is the widest kept (DIN SPEC 15800 DMX channel).
export type Bits = 8 | 16 | 24 | 32;

export type { RcProtocol, Transport } from '../vocab';
import type { RcProtocol, Transport } from '../vocab';

export interface ModeChannel {
	/** 1-based slot of the channel's first (coarse) byte; null for a virtual channel with no slot. */
	offset: number | null;
	parameter: string;
	bits: Bits;
	default: number;
	/**
	 * Physical range (e.g. 2000–10000 K, 0–360°) that the DMX range maps onto: `min` is the value at
	 * the range's first DMX value and `max` at its last, so a range may run downward (10000 → 2000 K).
	 */
	min?: number;
	max?: number;
	unit?: string;
	/** DMX sub-range the physical range covers (GDTF ChannelFunction DMXFrom); whole range when absent. */
	dmxFrom?: number;
	dmxTo?: number;
	/** DMX break the channel sits on (GDTF DMXChannel DMXBreak); 1 when absent. */
	dmxBreak?: number;
	/**
	 * Slots of the finer bytes, most significant first, when they do not follow the coarse byte
	 * (GDTF DMXChannel Offset "2,9"); absent when the bytes are adjacent.
	 */
	fineOffsets?: readonly number[];
}

export interface Mode {
	id: number;
	name: string;
	channels: readonly ModeChannel[];
	/** Stored footprint length; may only extend the computed one (reserved trailing slots). */
	slots?: number;
}

/** Where a further DMX break of a fixture starts (break 1 is the control's own universe and address). */
export interface BreakAddress {
	dmxBreak: number;
	universeId: number | null;
	address: number;
}

export interface DmxControl {
	kind: 'dmx';
	/** Universe and start address of break 1. */
	universeId: number | null;
	address: number;
	/** Breaks 2…n of a multi-break mode; absent for the usual one-break mode. */
	breaks?: readonly BreakAddress[];
}

export interface DmxMapControl {
	kind: 'dmx-map';
	universeId: number | null;
	addresses: Readonly<Record<string, number>>;
}

export interface RcControl {
	kind: 'rc';
	receiverId: number | null;
	channels: Readonly<Record<string, number>>;
}

export interface FollowControl {
	kind: 'follow';
	leaderId: number;
}

export interface ManualControl {
	kind: 'manual';
}

export type FixtureControl = DmxControl | DmxMapControl | RcControl | FollowControl | ManualControl;

export interface PatchFixture {
	id: number;
	number: number;
	label: string;
	typeId: number;
	modeId: number;
	linkGroup: string | null;
	control: FixtureControl;
}

export interface Universe {
	id: number;
	number: number;
	transport: Transport;
	name?: string;
}

export interface Receiver {
	id: number;
	protocol: RcProtocol;
	channelCount: number;
	name?: string;
}

/** Inclusive run of slots, 1–512. */
export interface SlotRange {
	start: number;
	end: number;
}

export type ConflictKind =
	| 'overlap'
	| 'shared'
	| 'linked'
	| 'overflow'
	| 'out-of-range'
	| 'rc-collision'
	| 'rc-unassigned'
	| 'line-overload'
	| 'follow-cycle'
	| 'missing-leader'
	| 'unknown-mode'
	| 'link-mismatch';

export type Severity = 'error' | 'warning' | 'info';

export interface Conflict {
	kind: ConflictKind;
	severity: Severity;
	universeId?: number;
	receiverId?: number;
	slots?: number[];
	channels?: number[];
	fixtureIds: number[];
	message: string;
}
