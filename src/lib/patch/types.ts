// Engine input shapes: the DESIGN.md "Shapes" in camelCase, narrowed to what the engine reads.

export type Bits = 8 | 16 | 24;

export type { RcProtocol, Transport } from '../vocab';
import type { RcProtocol, Transport } from '../vocab';

export interface ModeChannel {
	/** 1-based slot of the channel's first (coarse) byte; null for a virtual channel with no slot. */
	offset: number | null;
	parameter: string;
	bits: Bits;
	default: number;
	/** Physical range (e.g. 2000–10000 K, 0–360°) that the DMX range maps onto. */
	min?: number;
	max?: number;
	unit?: string;
}

export interface Mode {
	id: number;
	name: string;
	channels: readonly ModeChannel[];
	/** Stored footprint length; may only extend the computed one (reserved trailing slots). */
	slots?: number;
}

export interface DmxControl {
	kind: 'dmx';
	universeId: number | null;
	address: number;
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
	'overlap' | 'shared' | 'linked' | 'overflow' | 'out-of-range' | 'rc-collision' | 'rc-unassigned' | 'line-overload';

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
