import { and, eq, inArray } from 'drizzle-orm';
import { fitRun, formatLabel, modeSlotCount, renumberPlan } from '../../patch/index';
import { InvalidError, NotFoundError } from '../errors';
import { createFixtures, updateFixtures, type FixtureChange } from './fixtures';
import { db } from './index';
import { fixtureShape, listTypes, type FixtureShape } from './patch';
import { fixtures } from './schema';
import type { BulkAction, BulkAdd, BulkSetFields } from '../../schemas/fixture-bulk';
import type { FixtureCreate } from '../../schemas/fixture';

// The patch table's bulk tools: each action is one transaction through the same create/update
// functions (and checks) as single writes, so a refused batch leaves nothing behind.

export interface BulkResult {
	/** fixtures created or changed, in number order */
	fixtures: FixtureShape[];
	created: boolean;
}

function invalid(path: string, message: string): never {
	throw new InvalidError(message, [{ path: [path], message }]);
}

function chosen(projectId: number, ids: number[]): FixtureShape[] {
	const rows = db()
		.select()
		.from(fixtures)
		.where(and(eq(fixtures.projectId, projectId), inArray(fixtures.id, ids)))
		.all();
	if (rows.length !== ids.length) {
		const found = new Set(rows.map((r) => r.id));
		throw new NotFoundError(`No such fixture in this project: id ${ids.filter((i) => !found.has(i)).join(', ')}.`);
	}
	return rows.map(fixtureShape).sort((a, b) => a.number - b.number);
}

function add(projectId: number, userId: string, a: BulkAdd): BulkResult {
	const type = listTypes(projectId, [a.typeId]).find((t) => t.id === a.typeId);
	if (!type) invalid('typeId', 'No such fixture type in this project.');
	const mode = type.modes.find((m) => m.id === a.modeId);
	if (!mode) invalid('modeId', `Fixture type ${type.model} has no such mode.`);
	if ((a.universeId === null) !== (a.address === null))
		invalid(a.address === null ? 'address' : 'universeId', 'Give both a universe and a start address, or neither.');
	const slots = modeSlotCount(mode);
	if (a.address !== null) {
		const fit = fitRun(a.count, slots, a.address);
		if (fit.message) invalid('address', fit.message);
	}
	const inputs: FixtureCreate[] = Array.from({ length: a.count }, (_, i) => {
		const n = a.firstNumber + i;
		const label = a.labelPattern === '' ? type.model : formatLabel(a.labelPattern, { n, i: i + 1 });
		if (label.length > 60) invalid('labelPattern', `The label "${label}" is longer than 60 characters.`);
		if (n > 999999) invalid('firstNumber', `From ${a.firstNumber}, ${a.count} fixtures pass number 999999.`);
		return {
			number: n,
			label,
			typeId: a.typeId,
			modeId: a.modeId,
			position: '',
			group: '',
			linkGroup: null,
			colour: '',
			watts: null,
			notes: '',
			state: 'planned',
			look: {},
			control:
				a.universeId !== null && a.address !== null
					? { kind: 'dmx', universeId: a.universeId, address: a.address + i * Math.max(1, slots) }
					: { kind: 'manual' },
			feed: { kind: 'none' }
		};
	});
	return { fixtures: createFixtures(projectId, userId, inputs), created: true };
}

/** Copies keep type, mode, label, position, group, colour, watts, look and feed; they start unpatched and planned. */
function duplicate(projectId: number, userId: string, ids: number[], firstNumber: number | null): BulkResult {
	const originals = chosen(projectId, ids);
	const from =
		firstNumber ??
		(db()
			.select({ number: fixtures.number })
			.from(fixtures)
			.where(eq(fixtures.projectId, projectId))
			.all()
			.reduce((m, r) => Math.max(m, r.number), 0) ?? 0) + 1;
	const inputs: FixtureCreate[] = originals.map((f, i) => ({
		number: from + i,
		label: f.label,
		typeId: f.typeId,
		modeId: f.modeId,
		position: f.position,
		group: f.group,
		linkGroup: null,
		colour: f.colour,
		watts: f.watts,
		notes: f.notes,
		state: 'planned',
		look: f.look,
		control: { kind: 'manual' },
		feed: f.feed ?? { kind: 'none' }
	}));
	if (from + inputs.length - 1 > 999999) invalid('firstNumber', 'The copies would pass fixture number 999999.');
	return { fixtures: createFixtures(projectId, userId, inputs), created: true };
}

function setFields(projectId: number, userId: string, ids: number[], fields: BulkSetFields): FixtureChange[] {
	const list = chosen(projectId, ids);
	if (fields.modeId !== undefined) {
		const types = new Set(list.map((f) => f.typeId));
		if (types.size > 1)
			invalid(
				'fields',
				`The selection mixes ${types.size} fixture types; a mode belongs to one type, so choose fixtures of one type to change their mode together.`
			);
	}
	return list.map((f) => ({ id: f.id, version: f.version, ...fields }));
}

export function bulkFixtures(projectId: number, userId: string, action: BulkAction): BulkResult {
	return db().transaction(() => {
		switch (action.action) {
			case 'add':
				return add(projectId, userId, action);
			case 'duplicate':
				return duplicate(projectId, userId, action.ids, action.firstNumber);
			case 'renumber': {
				const list = chosen(projectId, action.ids);
				const last = action.from + (list.length - 1) * action.step;
				if (last > 999999)
					invalid(
						'from',
						`From ${action.from} in steps of ${action.step} the last number would be ${last}, past 999999.`
					);
				const version = new Map(list.map((f) => [f.id, f.version]));
				const changes = renumberPlan(list, action.from, action.step).map((p) => ({
					...p,
					version: version.get(p.id)!
				}));
				return { fixtures: updateFixtures(projectId, userId, changes), created: false };
			}
			case 'relabel': {
				const changes = chosen(projectId, action.ids).map((f, i) => {
					const label = formatLabel(action.pattern, { n: f.number, i: i + 1 });
					if (label.length > 60) invalid('pattern', `The label "${label}" is longer than 60 characters.`);
					return { id: f.id, version: f.version, label };
				});
				return { fixtures: updateFixtures(projectId, userId, changes), created: false };
			}
			case 'set':
				return {
					fixtures: updateFixtures(projectId, userId, setFields(projectId, userId, action.ids, action.fields)),
					created: false
				};
		}
	});
}
