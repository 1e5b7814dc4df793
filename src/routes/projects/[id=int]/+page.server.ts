import { requireRole } from '$lib/server/authz';
import { loadPatchCached } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

// Counts and open conflicts only: the overview never ships the fixture list.
export const load: PageServerLoad = async (event) => {
	const { projectId } = requireRole(event, event.params.id, 'viewer');
	const p = loadPatchCached(projectId);
	const byState: Record<string, number> = {};
	const byUniverse = new Map<number | null, number>();
	for (const f of p.fixtures) {
		byState[f.state] = (byState[f.state] ?? 0) + 1;
		const u = f.control.kind === 'dmx' || f.control.kind === 'dmx-map' ? f.control.universeId : null;
		byUniverse.set(u, (byUniverse.get(u) ?? 0) + 1);
	}
	const numberOf = new Map(p.fixtures.map((f) => [f.id, { number: f.number, label: f.label }]));
	const open = p.conflicts.filter((c) => c.severity !== 'info');
	return {
		total: p.fixtures.length,
		byState,
		universes: p.universes.map((u) => ({
			number: u.number,
			name: u.name,
			slotsUsed: u.slotsUsed,
			fixtures: byUniverse.get(u.id) ?? 0
		})),
		offDmx: byUniverse.get(null) ?? 0,
		conflicts: open
			.slice(0, 100)
			.map((c) => ({ ...c, fixtures: c.fixtureIds.map((id) => numberOf.get(id)).filter((x) => x !== undefined) })),
		conflictCount: open.length
	};
};
