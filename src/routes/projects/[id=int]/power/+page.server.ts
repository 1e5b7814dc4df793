import { requireRole } from '$lib/server/authz';
import { action, parseWith } from '$lib/server/forms';
import { InvalidError } from '$lib/server/errors';
import { listFixtures } from '$lib/server/db/patch';
import {
	createCircuit,
	createPackType,
	deleteCircuit,
	deletePackType,
	loadPower,
	setFeeds,
	updateCircuit,
	updatePackType,
	updatePowerSettings
} from '$lib/server/db/power';
import { circuitCreate, circuitPatch, packTypeCreate, packTypePatch, powerSettingsPatch } from '$lib/schemas/power';
import { PACK_LIBRARY } from '$lib/power-library';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { projectId, role } = requireRole(event, event.params.id, 'viewer');
	const view = loadPower(projectId);
	const versions = new Map(listFixtures(projectId).map((f) => [f.id, f.version]));
	return {
		role,
		...view,
		fixtures: view.fixtures.map((f) => ({ ...f, version: versions.get(f.id) ?? 1 })),
		library: PACK_LIBRARY.map((p) => ({ key: p.key, name: p.pack.name }))
	};
};

// Form fields arrive as text: empty means "not given"; numbers are read as numbers so the shared
// zod schema decides what is valid.
const num = (form: FormData, key: string): number | null | undefined => {
	const v = form.get(key);
	if (v === null) return undefined;
	const t = String(v).trim();
	if (t === '') return null;
	const n = Number(t.replace(',', '.'));
	return Number.isFinite(n) ? n : (t as unknown as number);
};
const text = (form: FormData, key: string) => {
	const v = form.get(key);
	return v === null ? undefined : String(v);
};
const drop = <T extends Record<string, unknown>>(o: T) =>
	Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as Partial<T>;

function packBody(form: FormData) {
	const capacity = num(form, 'capacity');
	const unit = text(form, 'unit') === 'Wh' ? 'wattHours' : 'ampHours';
	return drop({
		name: text(form, 'name'),
		chemistry: text(form, 'chemistry'),
		cells: num(form, 'cells') ?? undefined,
		[unit]: capacity ?? undefined,
		[unit === 'wattHours' ? 'ampHours' : 'wattHours']: capacity == null ? undefined : null,
		maxCurrentA: num(form, 'maxCurrentA') ?? undefined,
		onHand: num(form, 'onHand') ?? undefined,
		chargeHours: num(form, 'chargeHours'),
		chargers: num(form, 'chargers') ?? undefined,
		chargerBays: num(form, 'chargerBays') ?? undefined,
		notes: text(form, 'notes')
	});
}

function circuitBody(form: FormData) {
	return drop({
		name: text(form, 'name'),
		volts: num(form, 'volts') ?? undefined,
		breakerA: num(form, 'breakerA') ?? undefined,
		powerFactor: num(form, 'powerFactor') ?? undefined,
		notes: text(form, 'notes')
	});
}

const id = (form: FormData) => Number(form.get('id'));
const version = (form: FormData) => Number(form.get('version'));

function feedOf(value: string) {
	if (value === 'none') return { kind: 'none' as const };
	const [kind, ref] = value.split(':');
	const n = Number(ref);
	if (kind === 'battery' && Number.isInteger(n)) return { kind: 'battery' as const, packTypeId: n };
	if (kind === 'mains' && Number.isInteger(n)) return { kind: 'mains' as const, circuitId: n };
	throw new InvalidError('Choose a pack type, a circuit or none.', [{ path: ['feed'], message: 'Choose a feed.' }]);
}

export const actions: Actions = {
	addPack: action('addPack', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		createPackType(projectId, user.id, parseWith(packTypeCreate, packBody(form)));
		return { ok: 'addPack' };
	}),
	addPreset: action('addPreset', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const preset = PACK_LIBRARY.find((p) => p.key === form.get('preset'));
		if (!preset)
			throw new InvalidError('Choose a pack from the library.', [{ path: ['preset'], message: 'Choose one.' }]);
		createPackType(projectId, user.id, preset.pack);
		return { ok: 'addPreset' };
	}),
	editPack: action('editPack', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		updatePackType(
			projectId,
			user.id,
			id(form),
			parseWith(packTypePatch, { ...packBody(form), version: version(form) })
		);
		return { ok: 'editPack' };
	}),
	deletePack: action('deletePack', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		deletePackType(projectId, user.id, id(form), { detach: form.get('detach') === 'true', version: version(form) });
		return { ok: 'deletePack' };
	}),
	addCircuit: action('addCircuit', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		createCircuit(projectId, user.id, parseWith(circuitCreate, circuitBody(form)));
		return { ok: 'addCircuit' };
	}),
	editCircuit: action('editCircuit', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		updateCircuit(
			projectId,
			user.id,
			id(form),
			parseWith(circuitPatch, { ...circuitBody(form), version: version(form) })
		);
		return { ok: 'editCircuit' };
	}),
	deleteCircuit: action('deleteCircuit', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		deleteCircuit(projectId, user.id, id(form), { detach: form.get('detach') === 'true', version: version(form) });
		return { ok: 'deleteCircuit' };
	}),
	setDay: action('setDay', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const usable = num(form, 'usablePercent');
		updatePowerSettings(
			projectId,
			user.id,
			parseWith(powerSettingsPatch, {
				dayStart: text(form, 'dayStart'),
				dayWrap: text(form, 'dayWrap'),
				usableFraction: typeof usable === 'number' ? usable / 100 : undefined,
				version: version(form)
			})
		);
		return { ok: 'setDay' };
	}),
	setFeed: action('setFeed', (event, form) => {
		const { projectId, user } = requireRole(event, event.params.id, 'programmer');
		const chosen = form.getAll('fixture').map((v) => {
			const [fid, ver] = String(v).split(':').map(Number);
			return { id: fid!, version: ver! };
		});
		if (chosen.length === 0)
			throw new InvalidError('Tick the fixtures to set first.', [{ path: ['fixture'], message: 'Tick at least one.' }]);
		const n = setFeeds(projectId, user.id, chosen, feedOf(String(form.get('feed') ?? '')));
		return { ok: 'setFeed', count: n };
	})
};
