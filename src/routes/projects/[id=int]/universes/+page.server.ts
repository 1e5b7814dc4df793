import { requireRole } from '$lib/server/authz';
import { action, parseWith } from '$lib/server/forms';
import { num, rowId, text } from '$lib/server/form-fields';
import { loadPatchCached } from '$lib/server/db/patch';
import { createUniverse, deleteUniverse, updateUniverse } from '$lib/server/db/universes';
import { universeCreate, universePatch } from '$lib/schemas/universe';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { role, projectId } = requireRole(event, event.params.id, 'viewer');
	const p = loadPatchCached(projectId);
	// the fixtures each universe drives, so a delete can name them before anything is sent
	const users = new Map<number, { number: number; label: string }[]>();
	for (const f of p.fixtures)
		if ((f.control.kind === 'dmx' || f.control.kind === 'dmx-map') && f.control.universeId != null) {
			const list = users.get(f.control.universeId) ?? [];
			list.push({ number: f.number, label: f.label });
			users.set(f.control.universeId, list);
		}
	return {
		role,
		universes: p.universes.map((u) => ({
			...u,
			fixtures: users.get(u.id)?.length ?? 0,
			users: users.get(u.id) ?? [],
			errors: p.conflicts.filter((c) => c.universeId === u.id && c.severity === 'error').length
		}))
	};
};

export const actions: Actions = {
	create: action('create', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const input = parseWith(universeCreate, {
			number: num(form, 'number'),
			name: text(form, 'name'),
			transport: text(form, 'transport'),
			notes: text(form, 'notes')
		});
		const u = createUniverse(projectId, user.id, input);
		return { done: `Universe ${u.number} added.` };
	}),
	update: action('update', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const patch = parseWith(universePatch, {
			number: num(form, 'number'),
			name: text(form, 'name'),
			transport: text(form, 'transport'),
			notes: text(form, 'notes'),
			version: num(form, 'version')
		});
		const u = updateUniverse(projectId, user.id, rowId(form), patch);
		return { done: `Universe ${u.number} saved.` };
	}),
	delete: action('delete', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		deleteUniverse(projectId, user.id, rowId(form), text(form, 'detach') === '1');
		return { done: 'Universe deleted.' };
	})
};
