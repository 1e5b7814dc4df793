import { requireRole } from '$lib/server/authz';
import { action, parseWith } from '$lib/server/forms';
import { num, rowId, text } from '$lib/server/form-fields';
import { InvalidError } from '$lib/server/errors';
import { publish } from '$lib/server/live';
import { loadPatchCached } from '$lib/server/db/patch';
import { createType, deleteMode, deleteTypeMoving, updateType } from '$lib/server/db/fixture-types';
import { fixtureMove, typeCreate, typePatch, type FixtureMove } from '$lib/schemas/type';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { role, projectId } = requireRole(event, event.params.id, 'viewer');
	const p = loadPatchCached(projectId);
	// the fixtures on each mode, so a delete can name them (and move them) before anything is sent
	const users: Record<number, { id: number; number: number; label: string; version: number }[]> = {};
	for (const f of p.fixtures)
		(users[f.modeId] ??= []).push({ id: f.id, number: f.number, label: f.label, version: f.version });
	return { role, types: p.types, users };
};

/** The editor sends the whole type as one JSON field; unreadable JSON is a sentence, not a 500. */
function bodyOf(form: FormData): unknown {
	try {
		return JSON.parse(text(form, 'body') ?? '');
	} catch {
		throw new InvalidError('The form could not be read; reload the page and try again.');
	}
}

/** `toModeId` + `fixtures` (JSON of { id, version }) when the page offered to move them; else undefined. */
function moveOf(form: FormData): FixtureMove | undefined {
	const listed = text(form, 'fixtures');
	if (!listed) return undefined;
	let fixtures: unknown;
	try {
		fixtures = JSON.parse(listed);
	} catch {
		fixtures = undefined;
	}
	return parseWith(fixtureMove, { toModeId: num(form, 'toModeId'), fixtures });
}

export const actions: Actions = {
	create: action('create', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const t = createType(projectId, user.id, parseWith(typeCreate, bodyOf(form)));
		publish(projectId, { by: user.id, refetch: true });
		return { done: `${t.maker} ${t.model} added.`, id: t.id };
	}),
	update: action('update', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const t = updateType(projectId, user.id, rowId(form), parseWith(typePatch, bodyOf(form)));
		publish(projectId, { by: user.id, refetch: true });
		return { done: `${t.maker} ${t.model} saved.`, id: t.id };
	}),
	deleteMode: action('deleteMode', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const version = num(form, 'version');
		const t = deleteMode(
			projectId,
			user.id,
			rowId(form),
			version !== undefined && Number.isSafeInteger(version) ? version : 0,
			rowId(form, 'modeId'),
			moveOf(form)
		);
		publish(projectId, { by: user.id, refetch: true });
		return { done: `Mode deleted from ${t.maker} ${t.model}.`, id: t.id };
	}),
	delete: action('delete', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		deleteTypeMoving(projectId, user.id, rowId(form), moveOf(form));
		publish(projectId, { by: user.id, refetch: true });
		return { done: 'Fixture type deleted.' };
	})
};
