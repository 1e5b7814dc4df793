import { analysePatch, type FixtureFootprint, type PatchInput } from './conflicts';
import {
	artnetForUniverse,
	isSacnUniverse,
	sacnMulticastGroup,
	type ArtnetAddress,
	type ArtnetOffset
} from './numbering';
import { dmxFrameTiming, refreshFigures } from './refresh';
import type { Conflict, Transport } from './types';

export interface ComputePatchInput extends PatchInput {
	/** The project's Art-Net convention; 1 means paper universe 1 is port-address 0. */
	artnetOffset?: ArtnetOffset;
}

export interface UniverseSummary {
	universeId: number;
	number: number;
	transport: Transport;
	/** Highest claimed slot (0 when empty): what a frame must carry. Not a count — see `slotCount`. */
	slotsUsed: number;
	/** How many slots are claimed (gaps not counted). */
	slotCount: number;
	frameUs: number;
	/** Best case, frames stopping after `slotsUsed`. */
	refreshHz: number;
	/** A transmitter that always sends 512 slots. */
	refreshFullHz: number;
	/** Both figures in words: "up to 830 Hz if the transmitter sends 24 slots; 44 Hz at 512". */
	refreshText: string;
	/** Art-Net 4 deprecates port-address 0; set when this universe lands on it, else null. */
	artnetCaution: string | null;
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
	const claimed = new Map<number, Set<number>>();
	const note = (universeId: number | null, ranges: readonly { start: number; end: number }[]) => {
		if (universeId === null) return;
		let set = claimed.get(universeId);
		for (const r of ranges) {
			used.set(universeId, Math.max(used.get(universeId) ?? 0, r.end));
			if (set === undefined) claimed.set(universeId, (set = new Set()));
			for (let s = r.start; s <= r.end; s++) set.add(s);
		}
	};
	for (const f of footprints) {
		note(f.universeId, f.ranges);
		for (const b of f.breaks ?? []) note(b.universeId, b.ranges);
	}
	const offset = input.artnetOffset ?? 0;
	const universes = [...input.universes]
		.sort((a, b) => a.number - b.number || a.id - b.id)
		.map((u): UniverseSummary => {
			const slotsUsed = used.get(u.id) ?? 0;
			const timing = dmxFrameTiming(slotsUsed);
			const figures = refreshFigures(slotsUsed);
			const portAddress = u.number - offset;
			return {
				universeId: u.id,
				number: u.number,
				transport: u.transport,
				slotsUsed,
				slotCount: claimed.get(u.id)?.size ?? 0,
				frameUs: timing.frameUs,
				refreshHz: timing.rateHz,
				refreshFullHz: figures.fullHz,
				refreshText: figures.text,
				artnetCaution: u.transport === 'artnet' && portAddress === 0 ? artnetZeroCaution(u.number, offset) : null,
				sacn: isSacnUniverse(u.number) ? { universe: u.number, group: sacnMulticastGroup(u.number) } : null,
				artnet:
					Number.isInteger(portAddress) && portAddress >= 0 && portAddress <= 32767
						? artnetForUniverse(u.number, offset)
						: null
			};
		});
	return { fixtures: footprints, universes, conflicts };
}

/**
 * Art-Net 4 deprecates port-address 0 (from memory of the Art-Net 4 text; check it there), and some
 * nodes ignore it. With offset 1 ("paper universe 1 = port-address 0") paper universe 1 lands on it.
 */
export function artnetZeroCaution(paperUniverse: number, offset: ArtnetOffset): string {
	return offset === 1
		? `Universe ${paperUniverse} goes out as Art-Net port-address 0, which Art-Net 4 deprecates; some nodes ignore it. Set the project's Art-Net numbering to "paper = port-address" (universe 1 → port-address 1), or start at universe 2.`
		: `Universe ${paperUniverse} goes out as Art-Net port-address 0, which Art-Net 4 deprecates; some nodes ignore it. Use universe 1 or higher.`;
}

/** How the project's Art-Net numbering choice maps paper universes, in words for where it is shown. */
export function artnetOffsetText(offset: ArtnetOffset): string {
	return offset === 1
		? 'Paper universe 1 = Art-Net port-address 0 (net 0, sub-net 0, universe 0). Art-Net 4 deprecates port-address 0.'
		: 'Paper universe N = Art-Net port-address N (universe 1 = port-address 1); port-address 0 stays unused, as Art-Net 4 recommends.';
}
