import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/authz';
import { loadPatchCached } from '$lib/server/db/patch';
import type { PageServerLoad } from './$types';

// One universe: its fixtures (with their modes) and conflicts, plus the list
// of universes for the switcher.
export const load: PageServerLoad = async (event) => {
	const { projectId, role } = requireRole(event, event.params.id, 'viewer');
	const p = loadPatchCached(projectId);
	const n = Number(event.params.n);
	const universe = p.universes.find((u) => u.number === n);
	if (!universe) error(404, `No universe ${event.params.n} in this project`);
	const fixtures = p.fixtures.filter(
		(f) => (f.control.kind === 'dmx' || f.control.kind === 'dmx-map') && f.control.universeId === universe.id
	);
	const modeIds = new Set(fixtures.map((f) => f.modeId));
	const modes = p.types.flatMap((t) =>
		t.modes.filter((m) => modeIds.has(m.id)).map((m) => ({ ...m, typeName: `${t.maker} ${t.model}` }))
	);
	return {
		role,
		artnetOffset: p.project.artnetOffset,
		universe,
		universes: p.universes.map((u) => ({ id: u.id, number: u.number, name: u.name })),
		fixtures: fixtures.map((f) => ({
			id: f.id,
			number: f.number,
			label: f.label,
			modeId: f.modeId,
			control: f.control,
			slots: f.slots
		})),
		modes,
		conflicts: p.conflicts.filter((c) => c.universeId === universe.id)
	};
};
