import { parameterSlots, UNIVERSE_SLOTS, type FixtureControl, type Mode } from '$lib/patch';

// Who claims each of the 512 slots, and which parameter byte it is.

export interface SlotClaim {
	fixtureId: number;
	number: number;
	label: string;
	parameter: string;
	/** "coarse"/"fine" for 16-bit, "" for 8-bit */
	part: string;
	first: boolean;
}

export function slotClaims(
	fixtures: { id: number; number: number; label: string; modeId: number; control: FixtureControl }[],
	modes: Map<number, Mode>
): SlotClaim[][] {
	const claims: SlotClaim[][] = Array.from({ length: UNIVERSE_SLOTS + 1 }, () => []);
	for (const f of fixtures) {
		const mode = modes.get(f.modeId);
		if (!mode || (f.control.kind !== 'dmx' && f.control.kind !== 'dmx-map')) continue;
		const all = parameterSlots(f.control, mode);
		const lowest = Math.min(...all.flatMap((p) => p.slots));
		for (const p of all)
			p.slots.forEach((slot, i) => {
				if (slot < 1 || slot > UNIVERSE_SLOTS) return;
				const part = p.slots.length === 1 ? '' : i === 0 ? 'coarse' : p.slots.length === 2 ? 'fine' : `byte ${i + 1}`;
				claims[slot].push({
					fixtureId: f.id,
					number: f.number,
					label: f.label,
					parameter: p.parameter,
					part,
					first: slot === lowest
				});
			});
	}
	return claims;
}

/** Runs of unclaimed slots, for "where is there room". */
export function freeRuns(claims: SlotClaim[][]): { start: number; end: number }[] {
	const runs: { start: number; end: number }[] = [];
	for (let s = 1; s <= UNIVERSE_SLOTS; s++) {
		if (claims[s].length) continue;
		const last = runs[runs.length - 1];
		if (last && last.end === s - 1) last.end = s;
		else runs.push({ start: s, end: s });
	}
	return runs;
}

/** A hue per fixture number, spread by the golden angle so neighbours differ. */
export function fixtureHue(number: number): number {
	return Math.round((number * 137.508) % 360);
}

export type SlotKind = 'free' | 'one' | 'linked' | 'overlap';

/**
 * What each slot is: a link group (fixtures sharing an address on purpose, reported by the engine
 * as `linked`) is one intended block, not an overlap; anything else claimed twice is an overlap.
 */
export function slotKinds(claims: SlotClaim[][], linkedGroups: readonly (readonly number[])[]): SlotKind[] {
	const groups = linkedGroups.map((g) => new Set(g));
	return claims.map((list) => {
		if (list.length === 0) return 'free';
		if (list.length === 1) return 'one';
		const ids = new Set(list.map((c) => c.fixtureId));
		// one fixture claiming a slot twice is a self-overlap; a group must hold every claimant
		if (ids.size === list.length && groups.some((g) => [...ids].every((id) => g.has(id)))) return 'linked';
		return 'overlap';
	});
}
