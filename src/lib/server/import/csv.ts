import Papa from 'papaparse';
import { listCircuits, listPackTypes } from '../db/power';
import { feedText, parseFeed, sameFeed } from '../power-csv';
import { DomainError, UnprocessableError } from '../errors';
import {
	checkFixtureCreates,
	createFixtures,
	insertCheckedFixtures,
	updateFixtures,
	type FixtureChange
} from '../db/fixtures';
import { committedElsewhere, ownChanges } from '../db/change-state';
import { recordAudit } from '../db/audit';
import { getProject, projectShape } from '../db/projects';
import { db } from '../db/index';
import {
	conflictsFor,
	listFixtures,
	rowShape,
	listReceivers,
	listTypes,
	listUniverses,
	type FixtureRow,
	type TypeShape
} from '../db/patch';
import { createUniverses } from '../db/universes';
import { fixtureCreate, type ControlInput, type FixtureCreate } from '../../schemas/fixture';
import { universeCreate, type UniverseCreate } from '../../schemas/universe';
import type { ImportIssue } from './gdtf';
import type { BreakAddress, Feed } from '../../patch/index';
import type { FixtureShape } from '../../shapes';

// A patch spreadsheet as CSV: one row per fixture. Headers are matched loosely;
// rows name types by maker + model + mode and universes by number. The whole
// file is written in one transaction or not at all. The preview runs the same
// checks as apply (the fixture creates' checks without their insert; universes
// and updates written and rolled back), so what it shows is exactly what apply does.

export type CsvField =
	| 'number'
	| 'label'
	| 'maker'
	| 'model'
	| 'mode'
	| 'universe'
	| 'address'
	| 'patch'
	| 'position'
	| 'group'
	| 'notes'
	| 'feed'
	| 'range';

const SYNONYMS: Record<CsvField, string[]> = {
	number: [
		'number',
		'no',
		'num',
		'fixture',
		'fixturenumber',
		'fixtureno',
		'fixtureid',
		'unit',
		'unitnumber',
		'unitno',
		'id'
	],
	label: ['label', 'name', 'fixturelabel', 'fixturename', 'purpose'],
	maker: ['maker', 'manufacturer', 'make', 'brand', 'mfr', 'vendor'],
	model: ['model', 'type', 'fixturetype', 'fixturemodel', 'product'],
	mode: ['mode', 'dmxmode', 'personality', 'profile'],
	universe: ['universe', 'univ', 'uni', 'u', 'line', 'dmxuniverse'],
	address: [
		'address',
		'addr',
		'ch',
		'chan',
		'start',
		'startaddress',
		'startchannel',
		'dmx',
		'dmxaddress',
		'dmxstart',
		'dmxch'
	],
	patch: ['patch', 'universeaddress', 'univaddress', 'univaddr', 'uaddr', 'uaddress', 'dmxpatch'],
	position: ['position', 'pos', 'location', 'hangingposition', 'rigposition'],
	group: ['group', 'groupname'],
	notes: ['notes', 'note', 'comments', 'comment', 'remarks'],
	feed: ['feed', 'power', 'powerfeed'],
	// our export's range column: "1.1–6; break 2 2.10–13" carries the start of each further DMX break
	range: ['range', 'slotrange', 'dmxrange']
};

/** A column "break 2" (also "Break2 patch") holding universe.address for that DMX break. */
const BREAK_COLUMN = /^break(\d{1,2})(?:patch|address|universeaddress)?$/;
// DIN SPEC 15800 DMX mode: breaks are numbered from 1; break 1 is the universe and address columns
const MAX_BREAK = 64;

/** a whole rig in one file; the import runs in multi-row statements inside one transaction */
export const MAX_CSV_ROWS = 20000;

export function normaliseHeader(h: string): string {
	return h
		.toLowerCase()
		.replace(/#/g, 'number')
		.replace(/[^a-z0-9]/g, '');
}

const BY_NAME = new Map<string, CsvField>();
for (const [field, names] of Object.entries(SYNONYMS) as [CsvField, string[]][])
	for (const n of names) BY_NAME.set(n, field);

export function matchHeaders(header: string[]): {
	columns: Partial<Record<CsvField, number>>;
	ignored: string[];
	/** break number → column index, for "break 2"-style columns */
	breakColumns?: Map<number, number>;
} {
	const columns: Partial<Record<CsvField, number>> = {};
	const ignored: string[] = [];
	let breakColumns: Map<number, number> | undefined;
	header.forEach((h, i) => {
		const name = normaliseHeader(h);
		const field = BY_NAME.get(name);
		const brk = BREAK_COLUMN.exec(name);
		const n = brk ? Number(brk[1]) : 0;
		if (field && columns[field] === undefined) columns[field] = i;
		else if (n >= 2 && n <= MAX_BREAK && !breakColumns?.has(n)) (breakColumns ??= new Map()).set(n, i);
		else if (h.trim() !== '') ignored.push(h.trim());
	});
	return breakColumns ? { columns, ignored, breakColumns } : { columns, ignored };
}

export interface CsvRow {
	row: number;
	number: number;
	label?: string;
	maker?: string;
	model?: string;
	mode?: string;
	universe?: number;
	address?: number;
	position?: string;
	group?: string;
	notes?: string;
	feed?: string;
	/** Start of DMX breaks 2…n (a multi-break mode), by universe number; absent when the row gives none. */
	breaks?: { dmxBreak: number; universe: number; address: number }[];
}

/** Our own export guards cells against formula injection with a leading quote; take it back off on the way in. */
function cell(v: string | undefined): string {
	const t = (v ?? '').trim();
	// 39 is the quote: most cells are told apart without the expression
	return t.charCodeAt(0) === 39 && /^'[=+\-@\t\r]/.test(t) ? t.slice(1) : t;
}

function int(text: string): number | null {
	return /^\d+$/.test(text) ? Number(text) : null;
}

// "2.10", "2.10–13" (the export writes the break's slot range; its first slot is the start), 2/10, 2:10
const BREAK_PATCH = /^(\d{1,6})\s*[./:]\s*(\d{1,6})(?:\s*[–-]\s*\d{1,6})?$/;
const RANGE_BREAK = /^break\s*(\d{1,6})\s+(.*)$/i;

type BreakCells = Map<number, { text: string; where: string }>;

/** The break parts of the range column ("…; break 2 2.10–13"); other parts belong to break 1 or a map. */
function rangeBreaks(range: string, out: BreakCells): string | null {
	for (const part of range.split(';')) {
		const m = RANGE_BREAK.exec(part.trim());
		if (!m) continue;
		// the export writes "break 2 2.?" for a break with no address yet: nothing to import
		if (/\.\?$/.test(m[2].trim())) continue;
		const n = Number(m[1]);
		if (out.has(n)) return `The range column gives break ${n} twice.`;
		out.set(n, { text: m[2].trim(), where: 'range' });
	}
	return null;
}
/** Parses the text into rows (spreadsheet row numbers: the header is row 1) and row-level issues. */
export function parseCsvPatch(text: string): { rows: CsvRow[]; issues: ImportIssue[]; ignored: string[] } {
	const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { header: false, skipEmptyLines: false });
	const records = parsed.data;
	const issues: ImportIssue[] = [];
	if (records.length === 0 || records[0].every((c) => c.trim() === '')) {
		throw new UnprocessableError('The CSV has no header row.', [{ row: 1, field: 'header', message: 'Empty.' }], {
			code: 'invalid-file'
		});
	}
	const filled =
		records.length - 1 > MAX_CSV_ROWS ? records.slice(1).filter((r) => r.some((c) => c.trim() !== '')).length : 0;
	if (filled > MAX_CSV_ROWS) {
		throw new UnprocessableError(
			`The CSV has ${filled} rows; import at most ${MAX_CSV_ROWS} at a time.`,
			[{ row: MAX_CSV_ROWS + 2, field: 'row', message: 'Too many rows.' }],
			{ code: 'invalid-file' }
		);
	}
	const { columns, ignored, breakColumns } = matchHeaders(records[0]);
	const missing: string[] = [];
	if (columns.number === undefined) missing.push('number');
	if (columns.universe === undefined && columns.address === undefined && columns.patch === undefined)
		missing.push('universe and address');
	if (missing.length) {
		throw new UnprocessableError(
			`The CSV has no ${missing.join(' or ')} column (found: ${
				records[0]
					.map((h) => h.trim())
					.filter(Boolean)
					.join(', ') || 'nothing'
			}).`,
			missing.map((m) => ({ row: 1, field: m, message: 'Column not found.' })),
			{ code: 'invalid-file' }
		);
	}
	const rows: CsvRow[] = [];
	const seen = new Map<number, number>();
	// the row's helpers are made once, not once per row (a 20,000-row file)
	let rec: string[] = [];
	let row = 0;
	const get = (f: CsvField) => (columns[f] === undefined ? '' : cell(rec[columns[f]]));
	const bad = (field: string, message: string) => void issues.push({ row, field, message });
	const texts = (['label', 'maker', 'model', 'mode', 'position', 'group', 'notes', 'feed'] as const).filter(
		(f) => columns[f] !== undefined
	);
	const breakCells = columns.range !== undefined || breakColumns !== undefined;
	records.slice(1).forEach((record, i) => {
		rec = record;
		row = i + 2;
		if (rec.every((c) => c.trim() === '')) return;
		const num = int(get('number'));
		if (num === null || num < 1)
			return bad(
				'number',
				get('number') === '' ? 'A fixture number is needed.' : `"${get('number')}" is not a fixture number.`
			);
		if (seen.has(num)) return bad('number', `Fixture ${num} is also on row ${seen.get(num)}.`);
		seen.set(num, row);
		const out: CsvRow = { row, number: num };
		for (const f of texts) {
			const v = get(f);
			if (v !== '') out[f] = v;
		}
		let uText = get('universe');
		let aText = get('address');
		// "2.101" in the Universe column: the address rides along (an address column may repeat it)
		const inUniverse = /^(\d+)\s*[./:]\s*(\d+)$/.exec(uText);
		if (inUniverse) {
			if (aText !== '' && int(aText) !== Number(inUniverse[2]))
				return bad('address', `The universe column says ${uText} but the address column says ${aText}.`);
			uText = inUniverse[1];
			aText = inUniverse[2];
		}
		// "2.101" (also 2/101, 2:101) in the address or a combined column
		const patch = get('patch');
		const combined = /^(\d+)\s*[./:]\s*(\d+)$/.exec(patch || aText);
		if (combined) {
			if (uText !== '' && uText !== combined[1])
				return bad('universe', `The universe column says ${uText} but "${combined[0]}" says ${combined[1]}.`);
			uText = combined[1];
			aText = combined[2];
		} else if (patch !== '') return bad('address', `"${patch}" is not universe.address like 2.101.`);
		if (uText !== '' || aText !== '') {
			const u = int(uText);
			const a = int(aText);
			if (uText === '' && columns.universe === undefined && columns.patch === undefined)
				return bad(
					'address',
					`Write the address as universe.address (like 1.${aText}): the file has no universe column.`
				);
			if (u === null)
				return bad(
					'universe',
					uText === '' ? 'An address without a universe.' : `"${uText}" is not a universe number.`
				);
			if (a === null)
				return bad('address', aText === '' ? 'A universe without an address.' : `"${aText}" is not an address.`);
			out.universe = u;
			out.address = a;
		}
		// a file without a range or break column (most) has no further breaks to read
		if (!breakCells) {
			rows.push(out);
			return;
		}
		const cells: BreakCells = new Map();
		const twice = rangeBreaks(get('range'), cells);
		if (twice) return bad('range', twice);
		for (const [n, col] of breakColumns ?? []) {
			const text = cell(rec[col]);
			if (text === '') continue;
			const other = cells.get(n);
			if (other && other.text.replace(/\s*[–-].*$/, '') !== text.replace(/\s*[–-].*$/, ''))
				return bad(`break ${n}`, `The break ${n} column says ${text} but the range column says ${other.text}.`);
			cells.set(n, { text, where: `break ${n}` });
		}
		if (cells.size > 0) {
			const breaks: NonNullable<CsvRow['breaks']> = [];
			for (const [n, { text, where }] of [...cells].sort((x, y) => x[0] - y[0])) {
				if (n < 2 || n > MAX_BREAK)
					return bad(where, `Break ${n} is not a further DMX break; breaks 2–${MAX_BREAK} go here.`);
				const m = BREAK_PATCH.exec(text);
				if (!m) return bad(where, `"${text}" is not universe.address like 2.101 for break ${n}.`);
				breaks.push({ dmxBreak: n, universe: Number(m[1]), address: Number(m[2]) });
			}
			if (out.universe === undefined)
				return bad(
					'address',
					`Break ${breaks[0].dmxBreak} has a universe and address but break 1 has none; give break 1 in the universe and address columns.`
				);
			out.breaks = breaks;
		}
		rows.push(out);
	});
	return { rows, issues, ignored };
}

export interface CsvSummary {
	kind: 'csv';
	applied: boolean;
	rows: number;
	ignoredColumns: string[];
	universes: { number: number; name: string; action: 'create' }[];
	create: { row: number; number: number; label: string; type: string; mode: string; patch: string }[];
	update: { row: number; id: number; number: number; label: string; changes: string[] }[];
	conflicts: { kind: string; severity: string; message: string }[];
}

const FIELD_OF: Record<string, string> = {
	universeId: 'universe',
	address: 'address',
	addresses: 'address',
	typeId: 'model',
	modeId: 'mode'
};

function fieldOf(path: (string | number)[], breaks?: readonly { dmxBreak: number }[]): string {
	const names = path.filter((p): p is string => typeof p === 'string' && p !== 'control' && p !== 'fixtures');
	if (names[0] === 'breaks') {
		// control.breaks[k] is the row's k-th further break: name it as the file does
		const k = path[path.indexOf('breaks') + 1];
		const n = typeof k === 'number' ? breaks?.[k]?.dmxBreak : undefined;
		return n === undefined ? 'range' : `break ${n}`;
	}
	return FIELD_OF[names[0] ?? ''] ?? names[0] ?? 'row';
}

class Rollback extends Error {
	constructor(public summary: CsvSummary) {
		super('rollback');
	}
}

function issuesOf(
	err: unknown,
	many: boolean,
	rowAt: (i: number) => { row: number; breaks?: readonly { dmxBreak: number }[] }
): ImportIssue[] {
	if (!(err instanceof DomainError)) throw err;
	const list = err.issues() ?? [];
	if (list.length === 0) return [{ row: null, field: 'row', message: err.message }];
	return list.map((i) => {
		if (!('path' in i)) return i;
		// a batch's paths start with the item's index; a single write's do not
		const idx = many ? (i.path.find((p): p is number => typeof p === 'number') ?? 0) : 0;
		const at = rowAt(idx);
		return { row: at.row, field: fieldOf(i.path, at.breaks), message: i.message };
	});
}

function controlBreaks(c: ControlInput | undefined): readonly { dmxBreak: number }[] | undefined {
	return c?.kind === 'dmx' ? c.breaks : undefined;
}

type TypeMode =
	{ typeId: number; modeId: number; typeName: string; modeName: string } | { field: string; message: string };

/** The type and mode a row names (maker and model given), or why it names none. */
function lookUpTypeMode(
	byName: Map<string, TypeShape>,
	maker: string,
	model: string,
	modeName: string | undefined
): TypeMode {
	const type = byName.get(`${maker.toLowerCase()}\u0000${model.toLowerCase()}`);
	if (!type)
		return { field: 'model', message: `No fixture type "${maker} ${model}" in this project; add or import it first.` };
	const mode = modeName
		? type.modes.find((m) => m.name.toLowerCase() === modeName.toLowerCase())
		: type.modes.length === 1
			? type.modes[0]
			: undefined;
	if (!mode)
		return {
			field: 'mode',
			message: modeName
				? `${type.maker} ${type.model} has no mode "${modeName}" (modes: ${type.modes.map((m) => m.name).join(', ')}).`
				: `${type.maker} ${type.model} has several modes; name one.`
		};
	return { typeId: type.id, modeId: mode.id, typeName: `${type.maker} ${type.model}`, modeName: mode.name };
}

function patchText(u: number | undefined, a: number | undefined, breaks?: CsvRow['breaks']): string {
	if (u === undefined) return '';
	if (breaks === undefined) return `${u}.${a}`;
	return [`${u}.${a}`, ...(breaks ?? []).map((b) => `break ${b.dmxBreak} ${b.universe}.${b.address}`)].join('; ');
}

function breakKey(bs: readonly { dmxBreak: number; universeId: number | null; address: number }[] | undefined): string {
	return (bs ?? [])
		.map((b) => `${b.dmxBreak}:${b.universeId}.${b.address}`)
		.sort()
		.join(' ');
}

function sameDmx(
	a: { universeId: number | null; address: number; breaks?: readonly BreakAddress[] },
	b: { universeId: number; address: number; breaks?: readonly BreakAddress[] }
): boolean {
	return a.universeId === b.universeId && a.address === b.address && breakKey(a.breaks) === breakKey(b.breaks);
}

/** What a CSV row gives a new fixture, before the schema's defaults. */
export interface CreateValues {
	number: number;
	label?: string;
	typeId: number;
	modeId: number;
	position?: string;
	group?: string;
	notes?: string;
	control?: ControlInput;
	feed?: Feed;
}

const positiveInt = (n: unknown): n is number => Number.isInteger(n) && (n as number) > 0;
const slot = (n: unknown): n is number => Number.isInteger(n) && (n as number) >= 1 && (n as number) <= 512;
const within = (s: string | undefined, max: number) => s === undefined || s.length <= max;

/**
 * fixtureCreate.parse's answer, built directly when every value is plainly inside the schema's bounds
 * (the usual row of a 20,000-row file, where the schema's per-row pass cost more than the database
 * checks); null sends the row through the schema, whose messages say what is wrong. The cell text is
 * already trimmed. tests/unit/import/csv-create.test.ts holds the two answers equal.
 */
export function plainCreate(v: CreateValues): FixtureCreate | null {
	if (!positiveInt(v.number) || v.number > 999999 || !positiveInt(v.typeId) || !positiveInt(v.modeId)) return null;
	if (!within(v.label, 60) || !within(v.position, 120) || !within(v.group, 120) || !within(v.notes, 5000)) return null;
	let control: FixtureCreate['control'];
	const c = v.control;
	if (c === undefined || c.kind === 'manual') control = { kind: 'manual' };
	else if (c.kind === 'dmx' && positiveInt(c.universeId) && slot(c.address)) {
		if (c.breaks === undefined) control = { kind: 'dmx', universeId: c.universeId, address: c.address };
		else {
			if (c.breaks.length > 63) return null;
			const breaks: { dmxBreak: number; universeId: number; address: number }[] = [];
			const seen = new Set<number>();
			for (const b of c.breaks) {
				if (!Number.isInteger(b.dmxBreak) || b.dmxBreak < 2 || b.dmxBreak > 64 || seen.has(b.dmxBreak)) return null;
				if (!positiveInt(b.universeId) || !slot(b.address)) return null;
				seen.add(b.dmxBreak);
				breaks.push({ dmxBreak: b.dmxBreak, universeId: b.universeId, address: b.address });
			}
			control = { kind: 'dmx', universeId: c.universeId, address: c.address, breaks };
		}
	} else return null;
	let feed: FixtureCreate['feed'];
	const f = v.feed;
	if (f === undefined || f.kind === 'none') feed = { kind: 'none' };
	else if (f.kind === 'battery' && positiveInt(f.packTypeId)) feed = { kind: 'battery', packTypeId: f.packTypeId };
	else if (f.kind === 'mains' && positiveInt(f.circuitId)) feed = { kind: 'mains', circuitId: f.circuitId };
	else return null;
	return {
		number: v.number,
		label: v.label ?? '',
		typeId: v.typeId,
		modeId: v.modeId,
		position: v.position ?? '',
		group: v.group ?? '',
		linkGroup: null,
		colour: '',
		watts: null,
		notes: v.notes ?? '',
		state: 'planned',
		look: {},
		control,
		feed
	};
}

/** Plans and (with `apply`) writes the CSV rows; any bad row refuses the whole file with 422 naming every bad row. */
export function importCsv(projectId: number, userId: string, text: string, apply: boolean): CsvSummary {
	return importParsedCsv(projectId, userId, parseCsvPatch(text), apply);
}

export type ParsedCsv = ReturnType<typeof parseCsvPatch>;

/**
 * What a clean preview checked, so that applying the same file to the same, unchanged database can
 * write it without parsing and checking it again (import/csv-plan.ts keeps it).
 */
export interface CsvPlan {
	summary: CsvSummary;
	/** the universes to create, in the order the preview created them */
	universes: UniverseCreate[];
	/** the preview's (rolled back) universe ids → their numbers, to point the rows at apply's own ids */
	previewUniverses: Map<number, number>;
	/** the fixture rows the preview checked, as the insert writes them (timestamps are set again on apply) */
	rows: Omit<FixtureRow, 'id'>[];
	/** changes to existing fixtures; updateFixtures checks them again on apply (their versions too) */
	changes: FixtureChange[];
}

/**
 * `keep` receives a preview's plan with the database state it was checked against: the other
 * connections' commits as of the preview's first statement (which opens its read snapshot, so a later
 * commit makes the state differ, never the plan stale) and this connection's own change count after
 * the rollback.
 */
export type KeepPlan = (plan: CsvPlan, state: string) => void;

/** The state applyCsvPlan compares with a kept plan's (inside its transaction, which holds the write lock). */
export function planState(seen: string = committedElsewhere()): string {
	return `${seen}.${ownChanges()}`;
}

/** The database half of importCsv, for rows parsed elsewhere (a worker thread). */
export function importParsedCsv(
	projectId: number,
	userId: string,
	parsed: ParsedCsv,
	apply: boolean,
	keep?: KeepPlan
): CsvSummary {
	const { rows, ignored } = parsed;
	const issues = [...parsed.issues];
	if (rows.length === 0 && issues.length === 0)
		throw new UnprocessableError(
			'The CSV has a header but no fixture rows.',
			[{ row: 2, field: 'row', message: 'No rows.' }],
			{
				code: 'invalid-file'
			}
		);
	let seen = '';
	let plan: CsvPlan | undefined;
	// an apply writes: it takes the write lock at the start rather than upgrading to it midway
	const lock = { behavior: apply ? 'immediate' : 'deferred' } as const;
	try {
		return db().transaction(() => {
			// the first statement: it opens the read snapshot every check below reads
			seen = committedElsewhere();
			const types = listTypes(projectId);
			const byName = new Map(types.map((t) => [`${t.maker.toLowerCase()}\u0000${t.model.toLowerCase()}`, t]));
			const existing = new Map(listFixtures(projectId).map((f) => [f.number, f]));
			const universeIds = new Map(listUniverses(projectId).map((u) => [u.number, u.id]));
			const summary: CsvSummary = {
				kind: 'csv',
				applied: apply,
				rows: rows.length + issues.length,
				ignoredColumns: ignored,
				universes: [],
				create: [],
				update: [],
				conflicts: []
			};
			// universes the file names that the project lacks: checked, then created in one batch
			const newUniverses = new Map<number, UniverseCreate>();
			const named = (r: CsvRow, number: number | undefined, field: () => string) => {
				if (number === undefined || universeIds.has(number) || newUniverses.has(number)) return;
				const u = universeCreate.safeParse({ number, name: `Universe ${number}`, transport: 'dmx-wired' });
				if (!u.success) issues.push({ row: r.row, field: field(), message: u.error.issues[0].message });
				else newUniverses.set(number, u.data);
			};
			for (const r of rows) {
				named(r, r.universe, () => 'universe');
				for (const b of r.breaks ?? []) named(r, b.universe, () => `break ${b.dmxBreak}`);
			}
			const previewUniverses = new Map<number, number>();
			for (const u of createUniverses(projectId, userId, [...newUniverses.values()])) {
				universeIds.set(u.number, u.id);
				previewUniverses.set(u.id, u.number);
				summary.universes.push({ number: u.number, name: u.name, action: 'create' });
			}
			const badRows = new Set(issues.map((i) => i.row));
			// rows name a handful of types and modes thousands of times: each spelling is looked up once
			const typeModes = new Map<string, TypeMode>();
			const typeMode = (maker: string, model: string, mode: string | undefined): TypeMode => {
				const key = `${maker}\u0000${model}\u0000${mode ?? ''}`;
				let found = typeModes.get(key);
				if (!found) {
					found = lookUpTypeMode(byName, maker, model, mode);
					typeModes.set(key, found);
				}
				return found;
			};
			const creates: { row: CsvRow; input: FixtureCreate }[] = [];
			const changes: { row: CsvRow; change: FixtureChange; what: string[] }[] = [];
			const feedNames = { packTypes: listPackTypes(projectId), circuits: listCircuits(projectId) };
			let at = 0;
			const bad = (field: string, message: string) => void issues.push({ row: at, field, message });
			for (const r of rows) {
				if (badRows.has(r.row)) continue;
				at = r.row;
				const before = existing.get(r.number);
				const fed = r.feed === undefined ? undefined : parseFeed(r.feed, feedNames);
				if (fed && 'error' in fed) {
					bad('feed', fed.error);
					continue;
				}
				const feed = fed?.feed;
				let typeId: number | undefined;
				let modeId: number | undefined;
				let found: TypeMode | undefined;
				if (r.maker !== undefined || r.model !== undefined || r.mode !== undefined || !before) {
					if (!r.maker || !r.model) {
						bad(
							r.maker ? 'model' : 'maker',
							before ? 'To change the type give maker, model and mode.' : 'A new fixture needs a maker and a model.'
						);
						continue;
					}
					found = typeMode(r.maker, r.model, r.mode);
					if ('message' in found) {
						bad(found.field, found.message);
						continue;
					}
					typeId = found.typeId;
					modeId = found.modeId;
				}
				// a row that names no further breaks keeps the fixture's own, as long as its mode stays
				const keptBreaks =
					r.breaks === undefined && before?.control.kind === 'dmx' && (modeId ?? before.modeId) === before.modeId
						? before.control.breaks
						: undefined;
				const breaks =
					r.breaks?.map((b) => ({
						dmxBreak: b.dmxBreak,
						universeId: universeIds.get(b.universe)!,
						address: b.address
					})) ?? keptBreaks?.map((b) => ({ dmxBreak: b.dmxBreak, universeId: b.universeId ?? 0, address: b.address }));
				let control: Extract<ControlInput, { kind: 'dmx' }> | undefined;
				if (r.universe !== undefined) {
					control = { kind: 'dmx', universeId: universeIds.get(r.universe)!, address: r.address! };
					if (breaks !== undefined && breaks.length > 0) control.breaks = breaks;
				}
				if (!before) {
					const values: CreateValues = {
						number: r.number,
						label: r.label,
						typeId: typeId!,
						modeId: modeId!,
						position: r.position,
						group: r.group,
						notes: r.notes,
						control: control ?? { kind: 'manual' },
						feed
					};
					let input = plainCreate(values);
					if (!input) {
						const parsed = fixtureCreate.safeParse(values);
						if (!parsed.success) {
							for (const i of parsed.error.issues)
								bad(fieldOf(i.path.filter((p): p is string | number => typeof p !== 'symbol')), i.message);
							continue;
						}
						input = parsed.data;
					}
					creates.push({ row: r, input });
					const named = found as Exclude<TypeMode, { message: string }>;
					summary.create.push({
						row: r.row,
						number: r.number,
						label: r.label ?? '',
						type: named.typeName,
						mode: named.modeName,
						patch: patchText(r.universe, r.address, r.breaks)
					});
				} else {
					const change: FixtureChange = { id: before.id, version: before.version };
					const what: string[] = [];
					const set = <K extends 'label' | 'position' | 'group' | 'notes'>(k: K, v: string | undefined) => {
						if (v !== undefined && v !== before[k]) {
							change[k] = v;
							what.push(`${k} "${before[k]}" → "${v}"`);
						}
					};
					set('label', r.label);
					set('position', r.position);
					set('group', r.group);
					set('notes', r.notes);
					if (typeId !== undefined && (typeId !== before.typeId || modeId !== before.modeId)) {
						change.typeId = typeId;
						change.modeId = modeId;
						what.push('type/mode');
					}
					const c = before.control;
					if (control && !(c.kind === 'dmx' && sameDmx(c, control))) {
						change.control = control;
						what.push(`patch → ${patchText(r.universe, r.address, r.breaks)}`);
					}
					if (feed && !sameFeed(before.feed, feed)) {
						change.feed = feed;
						what.push(`feed → ${feedText(feed, feedNames)}`);
					}
					if (what.length === 0) continue;
					changes.push({ row: r, change, what });
					summary.update.push({
						row: r.row,
						id: before.id,
						number: r.number,
						label: change.label ?? before.label,
						changes: what
					});
				}
			}
			// every row is checked even when earlier ones failed, so the answer names all bad rows at once.
			// A preview runs the create checks without the insert (the rows it would write, numbered
			// -1, -2, … for the conflict check); an apply runs the same checks and inserts.
			let created: FixtureShape[] = [];
			let checked: Omit<FixtureRow, 'id'>[] = [];
			if (creates.length) {
				const inputs = creates.map((c) => c.input);
				try {
					if (apply) created = createFixtures(projectId, userId, inputs, 'none');
					else {
						checked = checkFixtureCreates(projectId, inputs);
						created = checked.map((row, i) => rowShape(row, -(i + 1)));
					}
				} catch (e) {
					issues.push(
						...issuesOf(e, creates.length > 1, (i) => {
							const c = creates[i] ?? creates[0];
							return { row: c.row.row, breaks: controlBreaks(c.input.control) };
						})
					);
				}
			}
			let updated: FixtureShape[] = [];
			if (changes.length) {
				try {
					updated = updateFixtures(
						projectId,
						userId,
						changes.map((c) => c.change)
					);
				} catch (e) {
					issues.push(
						...issuesOf(e, true, (i) => {
							const c = changes[i] ?? changes[0];
							return { row: c.row.row, breaks: controlBreaks(c.change.control) };
						})
					);
				}
			}
			if (issues.length > 0) {
				issues.sort((a, b) => (a.row ?? 0) - (b.row ?? 0));
				const rowsBad = new Set(issues.map((i) => i.row)).size;
				throw new UnprocessableError(
					`${rowsBad === 1 ? `Row ${issues[0].row} has a problem` : `${rowsBad} rows have problems`}; nothing was written.`,
					issues,
					{ code: 'invalid-rows' }
				);
			}
			// conflicts once for the whole file, over the patch as it stands after the writes: the
			// fixtures read at the start with this file's updates and creates in place of a second read
			const after = new Map([...existing.values()].map((f) => [f.id, f]));
			for (const f of [...updated, ...created]) after.set(f.id, f);
			const project = getProject(projectId);
			if (!project) throw new Error(`project ${projectId} not found`);
			summary.conflicts = conflictsFor(
				projectShape(project),
				types,
				listUniverses(projectId),
				listReceivers(projectId),
				[...after.values()].sort((a, b) => a.number - b.number)
			).map((c) => ({
				kind: c.kind,
				severity: c.severity,
				message: c.message
			}));
			if (apply && (created.length > 0 || updated.length > 0 || summary.universes.length > 0))
				// one entry for the whole file (the created fixtures are in their table; each update
				// also keeps its own before/after entry from updateFixtures)
				recordAudit({
					projectId,
					userId,
					action: 'fixture.import',
					entity: 'project',
					entityId: projectId,
					after: {
						rows: summary.rows,
						universes: summary.universes.map((u) => u.number),
						created: created.map((f) => ({ id: f.id, number: f.number })),
						updated: updated.map((f) => ({ id: f.id, number: f.number }))
					}
				});
			if (!apply) {
				if (keep)
					plan = {
						summary,
						universes: [...newUniverses.values()],
						previewUniverses,
						rows: checked,
						changes: changes.map((c) => c.change)
					};
				throw new Rollback(summary);
			}
			return summary;
		}, lock);
	} catch (e) {
		if (e instanceof Rollback) {
			if (plan && keep) keep(plan, planState(seen));
			return e.summary;
		}
		throw e;
	}
}

/**
 * Writes a kept preview plan, when the database is still in the state the preview checked it against
 * (`state`, from planState): the universes, the checked rows pointed at the new universes' ids, the
 * updates (checked again by updateFixtures) and the one audit entry, in one transaction. Answers null
 * with nothing written when anything at all was committed since: the caller then runs the whole import.
 */
export function applyCsvPlan(projectId: number, userId: string, plan: CsvPlan, state: string): CsvSummary | null {
	return db().transaction(
		() => {
			if (planState() !== state) return null;
			const made = createUniverses(projectId, userId, plan.universes);
			const idOf = new Map(made.map((u) => [u.number, u.id]));
			const ours = (id: number | null) => {
				const n = id === null ? undefined : plan.previewUniverses.get(id);
				return n === undefined ? id : idOf.get(n)!;
			};
			const now = new Date();
			// the plan is used once (csv-plan.ts takes it out of its cache): its rows are pointed in place
			for (const r of plan.rows) {
				r.universeId = ours(r.universeId);
				if (r.breakAddresses)
					r.breakAddresses = r.breakAddresses.map((b) => ({ ...b, universeId: ours(b.universeId)! }));
				r.createdAt = now;
				r.updatedAt = now;
			}
			const ids = insertCheckedFixtures(plan.rows);
			for (const c of plan.changes)
				if (c.control && c.control.kind !== 'manual' && 'universeId' in c.control)
					c.control = {
						...c.control,
						universeId: ours(c.control.universeId)!,
						...(c.control.kind === 'dmx' && c.control.breaks
							? { breaks: c.control.breaks.map((b) => ({ ...b, universeId: ours(b.universeId)! })) }
							: {})
					};
			const updated = plan.changes.length ? updateFixtures(projectId, userId, plan.changes) : [];
			const summary: CsvSummary = { ...plan.summary, applied: true };
			if (ids.length > 0 || updated.length > 0 || summary.universes.length > 0)
				recordAudit({
					projectId,
					userId,
					action: 'fixture.import',
					entity: 'project',
					entityId: projectId,
					after: {
						rows: summary.rows,
						universes: summary.universes.map((u) => u.number),
						created: ids.map((id, i) => ({ id, number: plan.rows[i].number })),
						updated: updated.map((f) => ({ id: f.id, number: f.number }))
					}
				});
			return summary;
		},
		{ behavior: 'immediate' }
	);
}
