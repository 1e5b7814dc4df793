import { analysePatch, type FixtureFootprint, type PatchInput } from './conflicts';
import {
	artnetForUniverse,
	isSacnUniverse,
	sacnMulticastGroup,
	type ArtnetAddress,
	type ArtnetOffset
} from './numbering';
import { dmxFrameTiming } from './refresh';
import type { Conflict, Transport } from './types';

export interface ComputePatchInput extends PatchInput {
	/** The project's Art-Net convention; 1 means paper universe 1 is port-address 0. */
	artnetOffset?: ArtnetOffset;
}

export interface UniverseSummary {
	universeId: number;
	number: number;
	transport: Transport;
	/** Highest claimed slot (0 when empty): what a frame must carry. */
	slotsUsed: number;
	frameUs: number;
	refreshHz: number;
	sacn: { universe: number; group: string } | null;
	artnet: (ArtnetAddress & { portAddress: number }) | null;
}

export interface PatchResult {
	fixtures: FixtureFootprint[];
	universes: UniverseSummary[];
	conflicts: Conflict[];
}

/** The whole computed patch: what `GET /patch` and `GET /conflicts` answer. */
export function computePatch(input: ComputePatchInput): PatchResult {
	const { footprints, conflicts } = analysePatch(input);
	const used = new Map<number, number>();
	for (const f of footprints) {
		if (f.universeId === null) continue;
		for (const r of f.ranges) used.set(f.universeId, Math.max(used.get(f.universeId) ?? 0, r.end));
	}
	const offset = input.artnetOffset ?? 0;
	const universes = [...input.universes]
		.sort((a, b) => a.number - b.number || a.id - b.id)
		.map((u): UniverseSummary => {
			const slotsUsed = used.get(u.id) ?? 0;
			const timing = dmxFrameTiming(slotsUsed);
			const portAddress = u.number - offset;
			return {
				universeId: u.id,
				number: u.number,
				transport: u.transport,
				slotsUsed,
				frameUs: timing.frameUs,
				refreshHz: timing.rateHz,
				sacn: isSacnUniverse(u.number) ? { universe: u.number, group: sacnMulticastGroup(u.number) } : null,
				artnet:
					Number.isInteger(portAddress) && portAddress >= 0 && portAddress <= 32767
						? artnetForUniverse(u.number, offset)
						: null
			};
		});
	return { fixtures: footprints, universes, conflicts };
}
