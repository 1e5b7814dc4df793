// The shapes the JSON API answers (DESIGN.md "Shapes"), client-safe: pages and components take
// their types from here, never from `$lib/server/…`. The db layer (src/lib/server/db/*) builds
// exactly these from rows; the API handlers and the server loads return them unchanged.

import type { BreakFootprint, Conflict, ModeChannel, PatchResult, SlotRange } from './patch/index';
import type { FixtureControl } from './patch/types';
import type { Feed } from './patch/power';
import type { FixtureState, RcProtocol, Role, SignoffDecision, Transport } from './vocab';

export interface Project {
	id: number;
	name: string;
	venue: string;
	startsOn: string | null;
	endsOn: string | null;
	notes: string;
	artnetOffset: number;
	version: number;
	createdAt: string;
	updatedAt: string;
	/** the caller's role, where the answer is about the caller */
	role?: Role;
}

export interface Member {
	userId: string;
	email: string | null;
	name: string | null;
	role: Role;
	version: number;
	since: string;
}

/** A mode's channel as the API shows it: exactly the engine's input. */
export type ChannelShape = ModeChannel;
export interface ModeShape {
	id: number;
	name: string;
	/** Footprint of break 1 (of the only break, for most modes). */
	slots: number;
	channels: ChannelShape[];
	/** Footprint per DMX break; present only when the mode has more than one. */
	breaks?: { dmxBreak: number; slots: number }[];
	// power (issue 15); optional so shapes built elsewhere (tests, snapshots) need not carry them
	watts?: number | null;
	inputVolts?: { min: number; max: number } | null;
}
export interface TypeShape {
	id: number;
	maker: string;
	model: string;
	notes: string;
	drawFloor?: number;
	version: number;
	modes: ModeShape[];
}
export interface FixtureShape {
	id: number;
	number: number;
	label: string;
	typeId: number;
	modeId: number;
	position: string;
	group: string;
	linkGroup: string | null;
	colour: string;
	watts: number | null;
	notes: string;
	state: FixtureState;
	version: number;
	look: { hue: number | null; saturation: number | null; intensity: number | null; cct: number | null };
	control: FixtureControl;
	/** optional: revision snapshots taken before power planning have none */
	feed?: Feed;
}
export interface UniverseShape {
	id: number;
	number: number;
	name: string;
	transport: Transport;
	notes: string;
	version: number;
}
export interface ReceiverShape {
	id: number;
	name: string;
	protocol: RcProtocol;
	channelCount: number;
	transmitterNotes: string;
	labels: Record<string, string>;
	version: number;
}

/** A universe with what the engine computes for it (slots used, sACN/Art-Net numbers). */
export type UniverseWithNumbers = UniverseShape & PatchResult['universes'][number];

/** `GET /api/projects/:pid/patch`: the patch and everything the engine computes from it. */
export interface PatchData {
	project: Project;
	universes: UniverseWithNumbers[];
	types: TypeShape[];
	receivers: ReceiverShape[];
	/** `breakSlots`: breaks 2…n of a multi-break mode, each with its universe and claimed slots. */
	fixtures: (FixtureShape & { slots: SlotRange[]; footprint: number | null; breakSlots?: BreakFootprint[] })[];
	conflicts: Conflict[];
}

export interface SignoffShape {
	decision: SignoffDecision;
	name: string;
	comment: string;
	at: string;
	stale: boolean;
}

export interface RevisionShape {
	number: number;
	note: string;
	author: string;
	createdAt: string;
	signoffs: SignoffShape[];
}

export interface ReviewLinkShape {
	id: number;
	revision: number | 'latest';
	label: string;
	createdBy: string;
	createdAt: string;
	expiresAt: string | null;
	revokedAt: string | null;
	status: 'active' | 'expired' | 'revoked';
}

/** What restoring a backup would create (`POST /api/projects/import-json?preview=true`); nothing is written. */
export interface BackupPreview {
	ok: boolean;
	/** the project's name in the file ('' when it could not be read) */
	name: string;
	/** the name the restored project gets: "<name> (restored <date>)" */
	restoredName: string;
	counts: { universes: number; types: number; modes: number; fixtures: number; receivers: number };
	/** a sentence for the whole file when it cannot be restored */
	message: string;
	problems: { field: string; message: string }[];
}
