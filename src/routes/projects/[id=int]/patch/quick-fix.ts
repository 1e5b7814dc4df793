import type { Conflict } from '$lib/patch';
import type { PatchData } from '$lib/shapes';
import { modeSlotCount } from '$lib/patch';
import { freshGroupName, linkProblem, nextFreeAddress, usedSlots } from './control-edit';

// One-click fixes offered beside a conflict. Each says in its label what it will change, so the
// button is its own preview; `changes` is the bulk PATCH body it sends (with each row's version).

type Fx = PatchData['fixtures'][number];
export interface QuickFix {
	label: string;
	/** a longer sentence for the button's description */
	preview: string;
	changes: { id: number; version: number; [field: string]: unknown }[];
}

function at(p: PatchData, universeId: number, address: number): string {
	return `${p.universes.find((u) => u.id === universeId)?.number ?? '?'}.${address}`;
}

function moveFix(p: PatchData, f: Fx): QuickFix | null {
	const next = nextFreeAddress(p, f);
	if (!next || f.control.kind !== 'dmx') return null;
	const { address, slots, universeId } = next;
	return {
		label: `Move ${f.number} to next free address ${at(p, universeId, address)}`,
		preview: `Fixture ${f.number} moves from ${at(p, universeId, f.control.address)} to ${at(p, universeId, address)} (slots ${address}–${address + slots - 1}, free now).`,
		changes: [
			{
				id: f.id,
				version: f.version,
				control: { ...f.control, universeId, address }
			}
		]
	};
}

/** Another mode of the same type that fits where the fixture is now (fewer slots), if one does. */
function modeFix(p: PatchData, f: Fx): QuickFix | null {
	const c = f.control;
	if (c.kind !== 'dmx' || c.universeId == null || c.breaks?.length) return null;
	const type = p.types.find((t) => t.id === f.typeId);
	const used = usedSlots(p, c.universeId, f.id);
	for (const m of type?.modes ?? []) {
		if (m.id === f.modeId || m.breaks?.length) continue;
		const n = modeSlotCount(m);
		const end = c.address + n - 1;
		if (end > 512) continue;
		let free = true;
		for (let s = c.address; s <= end && free; s++) free = !used.has(s);
		if (!free) continue;
		return {
			label: `Change ${f.number} to mode ${m.name}`,
			preview: `Fixture ${f.number} stays at ${at(p, c.universeId, c.address)} and takes ${n} slots (${c.address}–${end}) instead of ${f.footprint ?? '?'}.`,
			changes: [{ id: f.id, version: f.version, modeId: m.id }]
		};
	}
	return null;
}

function manualFix(f: Fx): QuickFix {
	return {
		label: `Set ${f.number} to manual`,
		preview: `Fixture ${f.number} stays in the patch with no address or leader; it is set by hand on the unit.`,
		changes: [{ id: f.id, version: f.version, control: { kind: 'manual' } }]
	};
}

export function quickFixesFor(p: PatchData, c: Conflict, byId: Map<number, Fx>): QuickFix[] {
	const list = c.fixtureIds.map((id) => byId.get(id)).filter((f): f is Fx => f !== undefined);
	if (!list.length) return [];
	// the fixture that moves: the last one patched by number, so the earlier units keep their address
	const last = [...list].sort((a, b) => b.number - a.number)[0];
	const fixes: QuickFix[] = [];
	switch (c.kind) {
		case 'overlap':
		case 'overflow':
		case 'out-of-range': {
			const move = moveFix(p, last);
			if (move) fixes.push(move);
			const mode = modeFix(p, last);
			if (mode) fixes.push(mode);
			fixes.push(manualFix(last));
			break;
		}
		case 'shared': {
			if (!linkProblem(p, list)) {
				const name = list.find((f) => f.linkGroup)?.linkGroup ?? freshGroupName(p);
				fixes.push({
					label: `Link ${list.map((f) => f.number).join(', ')} as ${name}`,
					preview: `They stay at one address on purpose: link group ${name}, no longer a warning.`,
					changes: list.map((f) => ({ id: f.id, version: f.version, linkGroup: name }))
				});
			}
			const move = moveFix(p, last);
			if (move) fixes.push(move);
			break;
		}
		case 'missing-leader':
		case 'follow-cycle':
			for (const f of list) if (f.control.kind === 'follow') fixes.push(manualFix(f));
			break;
		case 'rc-collision':
			fixes.push(manualFix(last));
			break;
	}
	return fixes;
}
