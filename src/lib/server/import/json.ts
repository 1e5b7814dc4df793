import { z } from 'zod';
import { DomainError, InvalidError, UnprocessableError } from '../errors';
import { createFixtures } from '../db/fixtures';
import { db } from '../db/index';
import { createProject, projectShape, type Project } from '../db/projects';
import { createReceiver } from '../db/receivers';
import { createType } from '../db/types';
import { createUniverse } from '../db/universes';
import { fixtureCreate, type FixtureCreate } from '../../schemas/fixture';
import { projectCreate } from '../../schemas/project';
import { receiverCreate } from '../../schemas/receiver';
import { typeCreate } from '../../schemas/type';
import { universeCreate } from '../../schemas/universe';
import { PROJECT_FORMAT, PROJECT_FORMAT_VERSION } from '../export/json';
import type { ImportIssue } from './gdtf';

// A project backup (export/json.ts) read back into a NEW project. Every part
// is checked by the schema its API route uses; ids in the file are only
// references and are mapped to the new rows' ids.

const withId = z.looseObject({ id: z.int().positive() });
const envelope = z.looseObject({
	format: z.literal(PROJECT_FORMAT, { message: `Not a ${PROJECT_FORMAT} file.` }),
	version: z.literal(PROJECT_FORMAT_VERSION, { message: `Only version ${PROJECT_FORMAT_VERSION} files are read.` }),
	project: z.looseObject({}),
	universes: z.array(withId).max(5000).default([]),
	types: z
		.array(withId.extend({ modes: z.array(withId).max(64) }))
		.max(5000)
		.default([]),
	receivers: z.array(withId).max(1000).default([]),
	fixtures: z.array(withId).max(20000).default([])
});

function strip<T extends { id?: unknown }>(o: T): Omit<T, 'id'> {
	const { id, ...rest } = o;
	void id;
	return rest;
}

/** Parses the text; answers 422 with every problem found, writing nothing. */
export function importProjectJson(userId: string, text: string): Project {
	let raw: unknown;
	try {
		raw = JSON.parse(text);
	} catch {
		throw new InvalidError('The file is not valid JSON.', undefined, { code: 'invalid-file' });
	}
	const issues: ImportIssue[] = [];
	const add = (prefix: (string | number)[], err: z.ZodError) => {
		for (const i of err.issues)
			issues.push({ row: null, field: [...prefix, ...i.path].map(String).join('.'), message: i.message });
	};
	const env = envelope.safeParse(raw);
	if (!env.success) {
		add([], env.error);
		throw new UnprocessableError('The file is not a project export this server reads.', issues, {
			code: 'invalid-file'
		});
	}
	const file = env.data;
	const project = projectCreate.safeParse(file.project);
	if (!project.success) add(['project'], project.error);
	const universes = file.universes.map((u, i) => {
		const r = universeCreate.safeParse(strip(u));
		if (!r.success) add(['universes', i], r.error);
		return { id: u.id, data: r.data };
	});
	const types = file.types.map((t, i) => {
		const r = typeCreate.safeParse({ ...strip(t), modes: t.modes.map(strip) });
		if (!r.success) add(['types', i], r.error);
		return { id: t.id, modeIds: t.modes.map((m) => m.id), data: r.data };
	});
	const receivers = file.receivers.map((x, i) => {
		const r = receiverCreate.safeParse(strip(x));
		if (!r.success) add(['receivers', i], r.error);
		return { id: x.id, data: r.data };
	});
	const fixtures = file.fixtures.map((f, i) => {
		const r = fixtureCreate.safeParse(strip(f));
		if (!r.success) add(['fixtures', i], r.error);
		return { id: f.id, index: i, data: r.data };
	});
	if (issues.length)
		throw new UnprocessableError(
			`The file has ${issues.length === 1 ? 'a problem' : `${issues.length} problems`}; nothing was created.`,
			issues,
			{ code: 'invalid-file' }
		);

	return db().transaction(() => {
		const created = createProject(userId, project.data!);
		const pid = created.id;
		const universeMap = new Map<number, number>();
		for (const u of universes) universeMap.set(u.id, createUniverse(pid, userId, u.data!).id);
		const typeMap = new Map<number, number>();
		const modeMap = new Map<number, number>();
		for (const t of types) {
			const shape = createType(pid, userId, t.data!);
			typeMap.set(t.id, shape.id);
			// createType keeps the modes' order
			t.modeIds.forEach((old, i) => modeMap.set(old, shape.modes[i].id));
		}
		const receiverMap = new Map<number, number>();
		for (const r of receivers) receiverMap.set(r.id, createReceiver(pid, userId, r.data!).id);
		const fixtureMap = new Map<number, number>();
		const missing: ImportIssue[] = [];
		const remap = (f: (typeof fixtures)[number]): FixtureCreate => {
			const d = f.data!;
			const need = (map: Map<number, number>, id: number, field: string) => {
				const to = map.get(id);
				if (to === undefined)
					missing.push({
						row: null,
						field: `fixtures.${f.index}.${field}`,
						message: `Refers to id ${id}, which the file does not contain.`
					});
				return to ?? id;
			};
			const c = d.control;
			const control =
				c.kind === 'dmx' || c.kind === 'dmx-map'
					? { ...c, universeId: need(universeMap, c.universeId, 'control.universeId') }
					: c.kind === 'rc'
						? { ...c, receiverId: need(receiverMap, c.receiverId, 'control.receiverId') }
						: c.kind === 'follow'
							? { ...c, leaderId: need(fixtureMap, c.leaderId, 'control.leaderId') }
							: c;
			return { ...d, typeId: need(typeMap, d.typeId, 'typeId'), modeId: need(modeMap, d.modeId, 'modeId'), control };
		};
		// leaders first, so followers can point at their new ids
		for (const batch of [
			fixtures.filter((f) => f.data!.control.kind !== 'follow'),
			fixtures.filter((f) => f.data!.control.kind === 'follow')
		]) {
			if (batch.length === 0) continue;
			const inputs = batch.map(remap);
			if (missing.length)
				throw new UnprocessableError('The file refers to rows it does not contain; nothing was created.', missing, {
					code: 'invalid-file'
				});
			let made;
			try {
				made = createFixtures(pid, userId, inputs);
			} catch (e) {
				if (!(e instanceof DomainError)) throw e;
				const list = e.issues() ?? [];
				throw new UnprocessableError(
					`A fixture in the file is not valid here: ${e.message}`,
					list.map((i) => {
						if (!('path' in i)) return i;
						const at = batch.length > 1 && typeof i.path[0] === 'number' ? i.path[0] : 0;
						const rest = batch.length > 1 ? i.path.slice(1) : i.path;
						return { row: null, field: ['fixtures', batch[at].index, ...rest].join('.'), message: i.message };
					}),
					{ code: 'invalid-file' }
				);
			}
			batch.forEach((f, i) => fixtureMap.set(f.id, made[i].id));
		}
		return projectShape(created, 'owner');
	});
}
