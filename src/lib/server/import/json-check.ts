import { z } from 'zod';
import { InvalidError, UnprocessableError, UnsupportedTypeError } from '../errors';
import { fixtureCreate, type FixtureCreate } from '../../schemas/fixture';
import { projectCreate } from '../../schemas/project';
import { receiverCreate, type ReceiverCreate } from '../../schemas/receiver';
import { typeCreate, type TypeCreate } from '../../schemas/type';
import { universeCreate, type UniverseCreate } from '../../schemas/universe';
import { PROJECT_FORMAT, PROJECT_FORMAT_VERSION } from '../export/json';
import { decodeText, sniff } from './limits';
import type { ImportIssue } from './gdtf';

// The check of a project backup (export/json.ts): decoding, JSON parsing and every part through
// the schema its API route uses. It reads no database, so it runs in a worker thread
// (workers/tasks.ts) with the pool's time and heap budget; the writes (json.ts) run after it.

/** A backup that passed every check: plain data, ids in the file kept only as references. */
export interface CheckedBackup {
	project: z.output<typeof projectCreate>;
	universes: { id: number; data: UniverseCreate }[];
	types: { id: number; modeIds: number[]; data: TypeCreate }[];
	receivers: { id: number; data: ReceiverCreate }[];
	fixtures: { id: number; index: number; data: FixtureCreate }[];
}

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

const SECTIONS = ['universes', 'types', 'fixtures'] as const;

/**
 * A file that is JSON but not a whole backup: a bare name, or a project with none of the lists an
 * export always writes (an empty project's export still has them, empty). Answers the sentence, or ''.
 */
function junk(raw: unknown): string {
	if (raw === null || typeof raw !== 'object' || Array.isArray(raw))
		return 'This file is not a project backup: it holds no project, only a single value or a list.';
	const o = raw as Record<string, unknown>;
	const missing = SECTIONS.filter((k) => !Array.isArray(o[k]));
	if (missing.length === SECTIONS.length)
		return 'This file is not a project backup: it has no universes, fixture types or fixtures lists, which every export writes (empty ones included).';
	return '';
}

function strip<T extends { id?: unknown }>(o: T): Omit<T, 'id'> {
	const { id, ...rest } = o;
	void id;
	return rest;
}

/** Decodes and checks the bytes of a backup; refuses (415/400/422 with every problem found) or answers the checked data. */
export function checkBackupBytes(bytes: Uint8Array): CheckedBackup {
	if (sniff(bytes) !== 'json') throw new UnsupportedTypeError('The file is not a JSON project export.');
	const text = decodeText(bytes);
	let raw: unknown;
	try {
		raw = JSON.parse(text);
	} catch {
		throw new InvalidError('The file is not valid JSON.', undefined, { code: 'invalid-file' });
	}
	const notBackup = junk(raw);
	if (notBackup) throw new UnprocessableError(notBackup, undefined, { code: 'invalid-file' });
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

	return {
		project: project.data!,
		universes: universes.map((u) => ({ id: u.id, data: u.data! })),
		types: types.map((t) => ({ id: t.id, modeIds: t.modeIds, data: t.data! })),
		receivers: receivers.map((r) => ({ id: r.id, data: r.data! })),
		fixtures: fixtures.map((f) => ({ id: f.id, index: f.index, data: f.data! }))
	};
}
