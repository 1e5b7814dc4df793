import { strToU8, zipSync } from 'fflate';
import Papa from 'papaparse';
import { eq } from 'drizzle-orm';
import { request } from 'node:http';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { gdtfZip, PANEL_XML, zeroBomb } from '../helpers/gdtf';
import { normaliseExport } from '../helpers/project-json';
import { startServer, type Client, type TestServer } from '../helpers/server';
import { auditLog, fixtureTypes, fixtures, universes } from '../../src/lib/server/db/schema';

// POST /api/projects/:pid/import (CSV patch, GDTF type), GET …/export.csv and
// …/export.json, POST /api/projects/import-json, and hostile uploads.

let server: TestServer;
let pid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
});
afterAll(() => server?.stop());

/**
 * A 21 MB multipart upload over node:http, which (unlike fetch) lets the server answer
 * before the body is all sent; writing stops once the answer arrives.
 */
function oversized(chunked: boolean): Promise<{ status: number; body: string }> {
	const boundary = 'xxBOUNDARYxx';
	const head = Buffer.from(
		`--${boundary}\r\ncontent-disposition: form-data; name="file"; filename="big.csv"\r\ncontent-type: text/csv\r\n\r\n`
	);
	const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
	const size = 21 * 1024 * 1024;
	const chunk = Buffer.alloc(64 * 1024, 0x41);
	return new Promise((resolve, reject) => {
		const url = new URL(`/api/projects/${pid}/import?apply=true`, server.url);
		const headers: Record<string, string> = {
			origin: server.url,
			cookie: [...as.programmer.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
			'content-type': `multipart/form-data; boundary=${boundary}`
		};
		if (!chunked) headers['content-length'] = String(head.length + size + tail.length);
		const req = request(url, { method: 'POST', headers });
		let answered = false;
		req.on('response', (res) => {
			answered = true;
			let body = '';
			res.on('data', (d: Buffer) => (body += d.toString()));
			res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
		});
		req.on('error', (e) => {
			if (!answered) reject(e);
		});
		req.write(head);
		let sent = 0;
		const pump = () => {
			while (!answered && sent < size) {
				sent += chunk.length;
				if (!req.write(chunk)) return void req.once('drain', pump);
			}
			if (!answered) req.end(tail);
		};
		pump();
	});
}

function upload(
	client: Client,
	path: string,
	bytes: Uint8Array | string,
	name: string,
	apply = false
): Promise<Response> {
	const form = new FormData();
	form.set('file', new Blob([typeof bytes === 'string' ? strToU8(bytes) : new Uint8Array(bytes)]), name);
	if (apply) form.set('apply', 'true');
	return client.fetch(path, { method: 'POST', body: form });
}
const importTo = (p: number, bytes: Uint8Array | string, name: string, apply = false, client = as.programmer) =>
	upload(client, `/api/projects/${p}/import`, bytes, name, apply);

const count = (table: typeof fixtures | typeof universes | typeof fixtureTypes, p = pid) =>
	server.db().select().from(table).where(eq(table.projectId, p)).all().length;

async function healthy() {
	expect((await fetch(`${server.url}/api/health`)).status).toBe(200);
}

async function newProject(name: string): Promise<number> {
	return (await (await as.programmer.post('/api/projects', { name })).json()).id;
}

describe('GDTF import', () => {
	it('previews without writing, then applies: modes with 16-bit and virtual channels give the right slot counts', async () => {
		const p = await newProject('GDTF');
		const preview = await importTo(p, gdtfZip(), 'tidepanel.gdtf');
		expect(preview.status).toBe(200);
		const body = await preview.json();
		expect(body).toMatchObject({ kind: 'gdtf', applied: false, exists: false });
		// DESIGN "Mode": gaps count, virtual channels take no slot
		expect(body.modes).toEqual([
			{ name: 'Basic 8', slots: 2, channels: 3 },
			{ name: 'HSI 16', slots: 5, channels: 3 },
			{ name: 'Cells', slots: 6, channels: 4 }
		]);
		expect(count(fixtureTypes, p)).toBe(0);
		const applied = await importTo(p, gdtfZip(), 'tidepanel.gdtf', true);
		expect(applied.status).toBe(201);
		const created = (await applied.json()).type;
		expect(created.id).toBeGreaterThan(0);
		expect(created.modes.map((m: { slots: number }) => m.slots)).toEqual([2, 5, 6]);
		const listed = (await (await as.programmer.get(`/api/projects/${p}/types`)).json()).types;
		expect(listed).toHaveLength(1);
		expect(listed[0]).toMatchObject({ maker: 'Harbourlight Works', model: 'Tidepanel One' });
		const again = await importTo(p, gdtfZip(), 'tidepanel.gdtf', true);
		expect(again.status).toBe(409);
		expect(count(fixtureTypes, p)).toBe(1);
	});

	it('needs programmer to import; viewer may export; outsiders get 404', async () => {
		expect((await importTo(pid, gdtfZip(), 'a.gdtf', true, as.viewer)).status).toBe(403);
		expect((await importTo(pid, gdtfZip(), 'a.gdtf', true, as.outsider)).status).toBe(404);
		expect((await as.viewer.get(`/api/projects/${pid}/export.csv`)).status).toBe(200);
		expect((await as.outsider.get(`/api/projects/${pid}/export.json`)).status).toBe(404);
		expect((await server.anonymous().get(`/api/projects/${pid}/export.json`)).status).toBe(401);
	});
});

async function makePanelType(p: number) {
	const res = await as.programmer.post(`/api/projects/${p}/types`, {
		maker: 'Acme Lamps',
		model: 'Deck Panel',
		modes: [
			{
				name: 'Basic',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 8 },
					{ offset: 2, parameter: 'cct', bits: 8 }
				]
			},
			{
				name: 'HSI 11',
				channels: [
					{ offset: 1, parameter: 'intensity', bits: 16 },
					{ offset: 3, parameter: 'hue', bits: 16 },
					{ offset: 11, parameter: 'strobe', bits: 8 }
				]
			}
		]
	});
	expect(res.status).toBe(201);
	return res.json();
}

describe('CSV patch import', () => {
	it('imports a file with loose headers and "2.101" cells; previews first; creates a missing universe; re-import updates', async () => {
		const p = await newProject('CSV good');
		await makePanelType(p);
		await as.programmer.post(`/api/projects/${p}/universes`, { number: 1 });
		const csv = [
			'Fixture #,Name,Manufacturer,Fixture Type,DMX Mode,Univ,DMX Address,Pos.',
			'1,Key 1,acme lamps,DECK PANEL,basic,1,1,Dock',
			'2,Key 2,Acme Lamps,Deck Panel,HSI 11,,2.101,Dock'
		].join('\n');
		const preview = await importTo(p, csv, 'patch.csv');
		expect(preview.status).toBe(200);
		const summary = await preview.json();
		expect(summary.universes).toEqual([{ number: 2, name: 'Universe 2', action: 'create' }]);
		expect(summary.create.map((c: { row: number; patch: string }) => [c.row, c.patch])).toEqual([
			[2, '1.1'],
			[3, '2.101']
		]);
		expect(count(fixtures, p)).toBe(0);
		expect(count(universes, p)).toBe(1);

		const applied = await importTo(p, csv, 'patch.csv', true);
		expect(applied.status).toBe(201);
		const patch = await (await as.programmer.get(`/api/projects/${p}/patch`)).json();
		expect(
			patch.fixtures.map((f: { number: number; label: string; slots: unknown }) => [f.number, f.label, f.slots])
		).toEqual([
			[1, 'Key 1', [{ start: 1, end: 2 }]],
			[2, 'Key 2', [{ start: 101, end: 111 }]]
		]);
		expect(patch.universes.map((u: { number: number; transport: string }) => [u.number, u.transport])).toEqual([
			[1, 'dmx-wired'],
			[2, 'dmx-wired']
		]);

		const moved = await importTo(p, 'number,universe,address\n2,2,201\n3,1,20', 'move.csv', true);
		expect(moved.status).toBe(422);
		expect((await moved.json()).error.issues).toEqual([
			{ row: 3, field: 'maker', message: 'A new fixture needs a maker and a model.' }
		]);
		const ok = await importTo(p, 'number,universe,address\n2,2,201', 'move.csv', true);
		expect(ok.status).toBe(201);
		expect((await ok.json()).update).toEqual([
			{ row: 2, id: expect.any(Number), number: 2, label: 'Key 2', changes: ['patch → 2.201'] }
		]);
		const f2 = (await (await as.programmer.get(`/api/projects/${p}/fixtures`)).json()).fixtures.find(
			(f: { number: number }) => f.number === 2
		);
		expect(f2).toMatchObject({ version: 2, label: 'Key 2', control: { kind: 'dmx', address: 201 } });
	});

	it('takes "2.101" in the Universe column (issue 18: it was refused as "not a universe number")', async () => {
		const p = await newProject('CSV universe.address');
		await makePanelType(p);
		const csv = [
			'Unit,Maker,Model,Mode,Universe',
			'1,Acme Lamps,Deck Panel,basic,2.101',
			'2,Acme Lamps,Deck Panel,basic,2.103'
		].join('\n');
		const applied = await importTo(p, csv, 'patch.csv', true);
		expect(applied.status).toBe(201);
		const patch = await (await as.programmer.get(`/api/projects/${p}/patch`)).json();
		const uni2 = patch.universes.find((u: { number: number }) => u.number === 2).id;
		expect(patch.fixtures.map((f: { number: number; control: unknown }) => [f.number, f.control])).toEqual([
			[1, { kind: 'dmx', universeId: uni2, address: 101 }],
			[2, { kind: 'dmx', universeId: uni2, address: 103 }]
		]);
	});

	it('the preview shows what apply writes; apply records one audit entry naming the fixtures it created', async () => {
		const p = await newProject('CSV audit');
		await makePanelType(p);
		// fixtures 1 and 2 overlap on slot 2 of universe 1 (Basic takes 2 slots): a conflict both answers list
		const csv = [
			'number,maker,model,mode,universe,address',
			'1,Acme Lamps,Deck Panel,Basic,1,1',
			'2,Acme Lamps,Deck Panel,Basic,1,2',
			'3,Acme Lamps,Deck Panel,Basic,3,10'
		].join('\n');
		const audit = () => server.db().select().from(auditLog).where(eq(auditLog.projectId, p)).all();
		const before = audit().length;
		const preview = await (await importTo(p, csv, 'rig.csv')).json();
		expect(audit().length).toBe(before);
		expect(count(fixtures, p)).toBe(0);
		const res = await importTo(p, csv, 'rig.csv', true);
		expect(res.status).toBe(201);
		const applied = await res.json();
		expect(preview.conflicts.some((c: { message: string }) => /overlap|slot 2/i.test(c.message))).toBe(true);
		expect({ ...preview, applied: true }).toEqual(applied);

		const made = server.db().select().from(fixtures).where(eq(fixtures.projectId, p)).all();
		const entries = audit().slice(before);
		expect(entries.filter((e) => e.action === 'fixture.create')).toEqual([]);
		const imports = entries.filter((e) => e.action === 'fixture.import');
		expect(imports).toHaveLength(1);
		expect(imports[0].after).toEqual({
			rows: 3,
			universes: [1, 3],
			created: made.map((f) => ({ id: f.id, number: f.number })).sort((a, b) => a.number - b.number),
			updated: []
		});
		// the fixture page's history still says how the fixture came to be
		const page = await (await as.programmer.get(`/projects/${p}/fixtures/2`)).text();
		expect(page).toContain('added the fixture by CSV import');

		// an update is listed in the file's entry and keeps its own before/after entry
		const moved = await importTo(p, 'number,universe,address\n2,1,3', 'move.csv', true);
		expect(moved.status).toBe(201);
		const later = audit().slice(before + entries.length);
		const two = made.find((f) => f.number === 2)!;
		expect(later.find((e) => e.action === 'fixture.import')?.after).toEqual({
			rows: 1,
			universes: [],
			created: [],
			updated: [{ id: two.id, number: 2 }]
		});
		expect(later.find((e) => e.action === 'fixture.update')).toMatchObject({
			entityId: String(two.id),
			before: { control: { address: 2 } },
			after: { control: { address: 3 } }
		});
	});

	it('one bad row writes nothing and every bad row is named (header = row 1)', async () => {
		const p = await newProject('CSV bad');
		await makePanelType(p);
		const csv = [
			'number,maker,model,mode,universe,address',
			'1,Acme Lamps,Deck Panel,Basic,1,1',
			'2,Acme Lamps,Deck Panel,Spot,1,3',
			// 11 slots from 505 run past 512: the fixture API's own footprint check
			'3,Acme Lamps,Deck Panel,HSI 11,1,505',
			'4,Acme Lamps,Deck Panel,Basic,1,20'
		].join('\n');
		const res = await importTo(p, csv, 'bad.csv', true);
		expect(res.status).toBe(422);
		const body = await res.json();
		expect(body.error.code).toBe('invalid-rows');
		expect(body.error.message).toContain('nothing was written');
		expect(body.error.issues.map((i: { row: number; field: string }) => [i.row, i.field])).toEqual([
			[3, 'mode'],
			[4, 'address']
		]);
		expect(body.error.issues[1].message).toContain('past 512');
		expect(count(fixtures, p)).toBe(0);
		expect(count(universes, p)).toBe(0);
	});
});

describe('exports', () => {
	it('CSV escapes formula-like cells with a leading quote and shows address ranges', async () => {
		const p = await newProject('Export');
		const type = await makePanelType(p);
		const u = await (await as.programmer.post(`/api/projects/${p}/universes`, { number: 2 })).json();
		const hsi = type.modes[1].id;
		await as.programmer.post(`/api/projects/${p}/fixtures`, [
			{
				number: 1,
				label: '=HYPERLINK("http://x.invalid")',
				typeId: type.id,
				modeId: hsi,
				notes: '@SUM(A1)',
				control: { kind: 'dmx', universeId: u.id, address: 101 }
			},
			{
				number: 2,
				label: '-neg',
				typeId: type.id,
				modeId: hsi,
				control: { kind: 'dmx-map', universeId: u.id, addresses: { intensity: 1, hue: 20, strobe: 30 } }
			}
		]);
		const res = await as.programmer.get(`/api/projects/${p}/export.csv`);
		expect(res.headers.get('content-type')).toContain('text/csv');
		expect(res.headers.get('content-disposition')).toBe('attachment; filename="export-patch.csv"');
		const rows = Papa.parse<Record<string, string>>(await res.text(), { header: true, skipEmptyLines: true }).data;
		expect(rows[0]).toMatchObject({
			number: '1',
			label: `'=HYPERLINK("http://x.invalid")`,
			notes: "'@SUM(A1)",
			universe: '2',
			address: '101',
			range: '2.101–111',
			slots: '11',
			control: 'dmx'
		});
		expect(rows[1]).toMatchObject({
			label: "'-neg",
			control: 'dmx-map',
			universe: '',
			address: '',
			range: 'intensity 2.1–2; hue 2.20–21; strobe 2.30'
		});
	});

	it('JSON round trip: export → import as a new project → export equals the first, ids and times aside', async () => {
		const p = await newProject('Round trip');
		await as.programmer.patch(`/api/projects/${p}`, {
			venue: 'Quay 4',
			notes: 'river unit',
			artnetOffset: 0,
			version: 1
		});
		const type = await makePanelType(p);
		const [basic, hsi] = type.modes.map((m: { id: number }) => m.id);
		const u1 = await (
			await as.programmer.post(`/api/projects/${p}/universes`, {
				number: 1,
				name: 'Dock',
				transport: 'sacn',
				notes: 'node A'
			})
		).json();
		const rx = await (
			await as.programmer.post(`/api/projects/${p}/receivers`, {
				name: 'Car rig',
				protocol: 'crsf',
				labels: { 1: 'left stick', 3: 'knob' }
			})
		).json();
		const made = await (
			await as.programmer.post(`/api/projects/${p}/fixtures`, [
				{
					number: 10,
					label: 'Leader',
					typeId: type.id,
					modeId: basic,
					linkGroup: 'L1',
					position: 'Mast',
					group: 'Keys',
					colour: 'amber',
					watts: 200,
					state: 'hung',
					look: { cct: 5600, intensity: 80 },
					control: { kind: 'dmx', universeId: u1.id, address: 1 }
				},
				{
					number: 11,
					label: 'Mapped',
					typeId: type.id,
					modeId: hsi,
					control: { kind: 'dmx-map', universeId: u1.id, addresses: { intensity: 40, hue: 50 } }
				},
				{
					number: 12,
					label: 'Radio',
					typeId: type.id,
					modeId: basic,
					control: { kind: 'rc', receiverId: rx.id, channels: { intensity: 1, cct: 2 } }
				},
				{ number: 14, label: 'Manual', typeId: type.id, modeId: basic }
			])
		).json();
		await as.programmer.post(`/api/projects/${p}/fixtures`, {
			number: 13,
			label: 'Follower',
			typeId: type.id,
			modeId: basic,
			control: { kind: 'follow', leaderId: made.fixtures[0].id }
		});

		const first = await (await as.programmer.get(`/api/projects/${p}/export.json`)).json();
		expect(first).toMatchObject({ format: 'patchwright-project', version: 1 });
		const imported = await as.owner.fetch('/api/projects/import-json', {
			method: 'POST',
			headers: { 'content-type': 'application/json' },
			body: JSON.stringify(first)
		});
		expect(imported.status).toBe(201);
		const project = await imported.json();
		expect(project).toMatchObject({ venue: 'Quay 4', role: 'owner' });
		// issue 16: never confused with the original
		expect(project.name).toMatch(/^Round trip \(restored \d{4}-\d{2}-\d{2}\)$/);
		expect(project.id).not.toBe(p);
		const second = await (await as.owner.get(`/api/projects/${project.id}/export.json`)).json();
		expect(second.fixtures[0].id).not.toBe(first.fixtures[0].id);
		expect(normaliseExport(second)).toEqual(normaliseExport(first));
		// the leader of the follower is the new project's fixture 10
		const follower = second.fixtures.find((f: { number: number }) => f.number === 13);
		expect(second.fixtures.find((f: { id: number }) => f.id === follower.control.leaderId).number).toBe(10);
	});

	it('JSON import refuses a foreign file with 422 and creates no project', async () => {
		const before = (await (await as.programmer.get('/api/projects')).json()).projects.length;
		const bad = await upload(
			as.programmer,
			'/api/projects/import-json',
			JSON.stringify({ format: 'something-else', version: 1 }),
			'x.json'
		);
		expect(bad.status).toBe(422);
		const broken = {
			format: 'patchwright-project',
			version: 1,
			project: { name: 'X' },
			universes: [],
			types: [],
			receivers: [],
			fixtures: [{ id: 1, number: 1, typeId: 99, modeId: 98 }]
		};
		const dangling = await as.programmer.post('/api/projects/import-json', broken);
		expect(dangling.status).toBe(422);
		expect((await dangling.json()).error.issues.map((i: { field: string }) => i.field)).toEqual([
			'fixtures.0.typeId',
			'fixtures.0.modeId'
		]);
		expect((await (await as.programmer.get('/api/projects')).json()).projects.length).toBe(before);
	});
});

describe('hostile uploads are refused cleanly, nothing is written, the server keeps answering', () => {
	const before = () => [count(fixtureTypes), count(fixtures), count(universes)];

	it('a body over the 20 MB limit: 413, whether declared by Content-Length or counted while reading a chunked body', async () => {
		const was = before();
		for (const chunked of [false, true]) {
			const res = await oversized(chunked);
			expect(res.status).toBe(413);
			expect(JSON.parse(res.body).error.code).toBe('too-large');
		}
		expect(before()).toEqual(was);
		await healthy();
	});

	it('a zip bomb (description.xml inflating to 48 MB from a few hundred KB): 413, inflation stopped at the limit', async () => {
		const was = before();
		const res = await importTo(pid, zeroBomb('description.xml', 48 * 1024 * 1024), 'bomb.gdtf', true);
		expect(res.status).toBe(413);
		expect((await res.json()).error.code).toBe('zip-too-large');
		expect(before()).toEqual(was);
		await healthy();
	});

	it('too many zip entries, and path-traversal entry names: 400', async () => {
		const many: Record<string, Uint8Array> = { 'description.xml': strToU8(PANEL_XML) };
		for (let i = 0; i < 2100; i++) many[`wheels/w${i}.png`] = new Uint8Array(1);
		const crowd = await importTo(pid, zipSync(many, { level: 0 }), 'crowd.gdtf', true);
		expect(crowd.status).toBe(400);
		expect((await crowd.json()).error.code).toBe('zip-entries');
		for (const name of ['../../etc/evil.xml', '/abs/path.xml', 'models\\x.3ds']) {
			const res = await importTo(
				pid,
				zipSync({ [name]: strToU8('x'), 'description.xml': strToU8(PANEL_XML) }),
				'trav.gdtf',
				true
			);
			expect(res.status).toBe(400);
			expect((await res.json()).error.code).toBe('zip-path');
		}
		expect(count(fixtureTypes)).toBe(0);
		await healthy();
	});

	it('XML with a DOCTYPE or entities (billion laughs, external entity): 400 before parsing', async () => {
		const laughs = PANEL_XML.replace(
			'<GDTF',
			'<!DOCTYPE GDTF [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;">]><GDTF'
		).replace('Name="Tidepanel"', 'Name="&b;"');
		const xxe = PANEL_XML.replace('<GDTF', '<!DOCTYPE GDTF [<!ENTITY x SYSTEM "file:///etc/passwd">]><GDTF').replace(
			'Name="Tidepanel"',
			'Name="&x;"'
		);
		for (const xml of [laughs, xxe]) {
			const res = await importTo(pid, gdtfZip(xml), 'dtd.gdtf', true);
			expect(res.status).toBe(400);
			expect((await res.json()).error.code).toBe('xml-dtd');
		}
		expect(count(fixtureTypes)).toBe(0);
		await healthy();
	});

	it('wrong file types by content: a PNG named .csv, text named .gdtf, JSON to the patch import, not multipart: 415', async () => {
		const png = new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0, 0, 0, 13]);
		expect((await importTo(pid, png, 'patch.csv', true)).status).toBe(415);
		expect((await importTo(pid, 'number,universe,address\n1,1,1', 'fixture.gdtf', true)).status).toBe(415);
		expect((await importTo(pid, '{"format":"patchwright-project"}', 'backup.json', true)).status).toBe(415);
		expect((await as.programmer.post(`/api/projects/${pid}/import`, { file: 'x' })).status).toBe(415);
		expect((await upload(as.programmer, '/api/projects/import-json', gdtfZip(), 'x.json')).status).toBe(415);
		expect(before()).toEqual([0, 0, 0]);
		await healthy();
	});
});
