import { requireRole } from '$lib/server/authz';
import { action, parseWith } from '$lib/server/forms';
import { num, rowId, text } from '$lib/server/form-fields';
import { loadPatchCached } from '$lib/server/db/patch';
import { assignReceiver, createReceiver, deleteReceiver, updateReceiver } from '$lib/server/db/receivers';
import { receiverCreate, receiverPatch } from '$lib/schemas/receiver';
import { publish } from '$lib/server/live';
import { summarizeAssign } from './assign-summary';
import type { Actions, PageServerLoad } from './$types';

// Receivers with, per channel, which parameter of which fixture it drives.
export const load: PageServerLoad = async (event) => {
	const { role, projectId } = requireRole(event, event.params.id, 'viewer');
	const p = loadPatchCached(projectId);
	const rc = p.fixtures.filter((f) => f.control.kind === 'rc');
	return {
		role,
		receivers: p.receivers.map((r) => ({
			...r,
			drives: rc.flatMap((f) =>
				f.control.kind === 'rc' && f.control.receiverId === r.id
					? Object.entries(f.control.channels).map(([parameter, channel]) => ({
							channel,
							parameter,
							fixtureId: f.id,
							number: f.number,
							label: f.label
						}))
					: []
			),
			fixtures: rc
				.filter((f) => f.control.kind === 'rc' && f.control.receiverId === r.id)
				.map((f) => ({ id: f.id, number: f.number, label: f.label }))
		})),
		unassigned: rc
			.filter((f) => f.control.kind === 'rc' && f.control.receiverId == null)
			.map((f) => ({ id: f.id, number: f.number, label: f.label })),
		conflicts: p.conflicts.filter((c) => c.kind === 'rc-collision' || c.kind === 'rc-unassigned')
	};
};

/** `label-3` fields → { "3": "left stick up/down" }; empty ones are left out (no label). */
function labelsOf(form: FormData): Record<string, string> {
	const labels: Record<string, string> = {};
	for (const [key, value] of form) {
		const m = /^label-([1-9]\d?)$/.exec(key);
		if (m && typeof value === 'string' && value.trim() !== '') labels[m[1]] = value.trim();
	}
	return labels;
}

function receiverFields(form: FormData) {
	return {
		name: text(form, 'name'),
		protocol: text(form, 'protocol'),
		transmitterNotes: text(form, 'transmitterNotes'),
		labels: labelsOf(form)
	};
}

function assignOptions(form: FormData) {
	// hand-set channels stay unless the programmer asks to reassign them (issue 18)
	return { keepExisting: text(form, 'reassign') !== '1' };
}

export const actions: Actions = {
	create: action('create', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const input = parseWith(receiverCreate, receiverFields(form));
		const r = createReceiver(projectId, user.id, input);
		publish(projectId, { by: user.id, refetch: true });
		return { done: `Receiver "${r.name}" added.` };
	}),
	update: action('update', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const patch = parseWith(receiverPatch, { ...receiverFields(form), version: num(form, 'version') });
		const r = updateReceiver(projectId, user.id, rowId(form), patch);
		publish(projectId, { by: user.id, refetch: true });
		return { done: `Receiver "${r.name}" saved.` };
	}),
	delete: action('delete', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		deleteReceiver(projectId, user.id, rowId(form), text(form, 'detach') === '1');
		publish(projectId, { by: user.id, refetch: true });
		return { done: 'Receiver deleted.' };
	}),
	preview: action('preview', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const id = rowId(form);
		const before = loadPatchCached(projectId);
		const o = assignOptions(form);
		const result = assignReceiver(projectId, user.id, id, { ...o, apply: false });
		return { preview: summarizeAssign(id, before.fixtures, result, o.keepExisting) };
	}),
	assign: action('assign', async (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const id = rowId(form);
		const before = loadPatchCached(projectId);
		const o = assignOptions(form);
		const result = assignReceiver(projectId, user.id, id, { ...o, apply: true });
		publish(projectId, { ids: [...new Set(result.assigned.map((a) => a.fixtureId))], by: user.id });
		return { assigned: summarizeAssign(id, before.fixtures, result, o.keepExisting) };
	})
};
