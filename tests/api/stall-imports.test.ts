import { eq, sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { gdtfZip, PANEL_XML } from '../helpers/gdtf';
import { channels, makeType } from '../helpers/patch-factories';
import { startServer, type TestServer } from '../helpers/server';
import { fixtures, projects, universes } from '../../src/lib/server/db/schema';

// Issue 20: imports run in linear time and never stall the server; the CSV cap is 20,000 rows.

let server: TestServer;
let pid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const db = server.db();
	const { project, crew, outsider } = await makeCrew(db);
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	makeType(db, pid, { Single: channels(1) }, 'Bulk Par');
});
afterAll(() => server?.stop());

/** `count` one-slot fixtures spread over 50 new universes, 1 slot apart (ANSI E1.11: slots 1–512). */
function bigCsv(count: number, firstNumber = 1): string {
	const perUniverse = Math.ceil(count / 50);
	const lines = ['Number,Maker,Model,Mode,Universe,Address'];
	for (let i = 0; i < count; i++)
		lines.push(
			`${firstNumber + i},Testworks,Bulk Par,Single,${Math.floor(i / perUniverse) + 1},${(i % perUniverse) + 1}`
		);
	return lines.join('\r\n');
}

/** A project backup (export/json.ts format) holding `count` universes numbered 1…count. */
function backup(count: number, name: string) {
	return {
		format: 'patchwright-project',
		version: 1,
		project: { name },
		universes: Array.from({ length: count }, (_, i) => ({ id: i + 1, number: i + 1, name: `L${i + 1}` }))
	};
}

function importForm(csv: string) {
	const form = new FormData();
	form.set('file', new Blob([csv]), 'rig.csv');
	return form;
}

describe('large imports', () => {
	it('a 20,000-row CSV naming 50 new universes previews and applies; health answers meanwhile', async () => {
		const csv = bigCsv(20000);
		const preview = as.programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: importForm(csv) });
		const health = await server.anonymous().get('/api/health');
		expect(health.status).toBe(200);
		const p = await preview;
		expect(p.status).toBe(200);
		const summary = await p.json();
		expect(summary.create).toHaveLength(20000);
		expect(summary.universes).toHaveLength(50);
		expect(
			server
				.db()
				.select({ n: sql<number>`count(*)` })
				.from(fixtures)
				.where(eq(fixtures.projectId, pid))
				.get()!.n
		).toBe(0);

		const applied = await as.programmer.fetch(`/api/projects/${pid}/import?apply=true`, {
			method: 'POST',
			body: importForm(csv)
		});
		expect(applied.status).toBe(201);
		const db = server.db();
		expect(
			db
				.select({ n: sql<number>`count(*)` })
				.from(fixtures)
				.where(eq(fixtures.projectId, pid))
				.get()!.n
		).toBe(20000);
		expect(
			db
				.select({ n: sql<number>`count(*)` })
				.from(universes)
				.where(eq(universes.projectId, pid))
				.get()!.n
		).toBe(50);
		const f = await (await as.viewer.get(`/api/projects/${pid}/patch`)).json();
		const last = f.fixtures.find((x: { number: number }) => x.number === 20000);
		expect(last.control).toMatchObject({ kind: 'dmx', address: 400 });
	});

	it('refuses 20,001 rows with 422 naming the cap', async () => {
		const res = await as.programmer.fetch(`/api/projects/${pid}/import`, {
			method: 'POST',
			body: importForm(bigCsv(20001, 30001))
		});
		expect(res.status).toBe(422);
		expect((await res.json()).error.message).toContain('at most 20000');
	});

	it('restores a JSON backup with 2,000 universes; health answers meanwhile', async () => {
		const restoring = as.programmer.post('/api/projects/import-json', backup(2000, 'Two thousand lines'));
		expect((await server.anonymous().get('/api/health')).status).toBe(200);
		const res = await restoring;
		expect(res.status).toBe(201);
		const id = (await res.json()).id;
		const list = await (await as.programmer.get(`/api/projects/${id}/universes`)).json();
		expect(list.universes).toHaveLength(2000);
		expect(list.universes[1999]).toMatchObject({ number: 2000, name: 'L2000' });
	});

	it.each([
		// WHATWG Encoding Standard windows-1252 index: é = 0xE9, ü = 0xFC
		['Windows-1252', (t: string) => Uint8Array.from([...t].map((c) => ({ é: 0xe9, ü: 0xfc })[c] ?? c.charCodeAt(0)))],
		// Unicode Standard §23.8: FF FE starts UTF-16LE
		['UTF-16LE with BOM', (t: string) => Uint8Array.from([0xff, 0xfe, ...Buffer.from(t, 'utf16le')])]
	])('reads a %s CSV as desktop spreadsheets save it', async (_, encode) => {
		const text =
			'Number;Label;Maker;Model;Mode;Universe;Address\r\n90001;Café Müller;Testworks;Bulk Par;Single;60;1\r\n';
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(encode(text))]), 'rig.csv');
		const res = await as.programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form });
		expect(res.status).toBe(200);
		expect((await res.json()).create[0]).toMatchObject({ number: 90001, label: 'Café Müller', patch: '60.1' });
	});

	it('asks for CSV UTF-8 when the encoding cannot be decided (never "not a CSV")', async () => {
		const form = new FormData();
		// 0x81 is undefined in windows-1252 and invalid as UTF-8
		form.set(
			'file',
			new Blob([Uint8Array.from([...Buffer.from('Number,Label,Universe,Address\n1,'), 0x81, 0x2c, 0x31, 0x2c, 0x31])]),
			'rig.csv'
		);
		const res = await as.programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form });
		expect(res.status).toBe(415);
		const body = await res.json();
		expect(body.error.message).toContain('CSV UTF-8');
		expect(body.error.message).not.toContain('neither');
	});
});

describe('GDTF files refused at the XML stage', () => {
	const send = (xml: string) => {
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(gdtfZip(xml))]), 'huge.gdtf');
		return as.programmer.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form });
	};

	it('a fixture type with two million attributes: 413 with a sentence, health answers meanwhile', async () => {
		const attrs: string[] = [];
		for (let i = 0; i < 2_000_000; i++) attrs.push(`a${i}=""`);
		const sending = send(PANEL_XML.replace('<FixtureType ', `<FixtureType ${attrs.join(' ')} `));
		expect((await server.anonymous().get('/api/health')).status).toBe(200);
		const res = await sending;
		expect(res.status).toBe(413);
		const body = await res.json();
		expect(body.error.code).toBe('xml-attributes');
		expect(body.error.message).toMatch(/^An element of description\.xml has more than 256 attributes/);
	});

	it('one 20 MB attribute: 413 naming its length', async () => {
		const res = await send(
			PANEL_XML.replace('Description="An invented soft panel."', `Description="${'x'.repeat(20 * 1024 * 1024)}"`)
		);
		expect(res.status).toBe(413);
		const body = await res.json();
		expect(body.error.code).toBe('xml-attribute-length');
		expect(body.error.message).toContain('20,971,520 characters long');
	});
});

describe('a job over its budget', () => {
	let slow: TestServer;
	let programmer: Awaited<ReturnType<typeof signInCrew>>['programmer'];
	let project: number;
	beforeAll(async () => {
		// a 1 ms budget: every worker job runs over it, so the refusal path is exercised for real
		slow = await startServer({ env: { PATCHWRIGHT_JOB_TIME_MS: '1' } });
		const made = await makeCrew(slow.db());
		project = made.project.id;
		programmer = (await signInCrew(slow, made.crew, made.outsider)).programmer;
	});
	afterAll(() => slow?.stop());

	it('is stopped and answered 422; the server keeps answering', async () => {
		const res = await programmer.fetch(`/api/projects/${project}/import`, {
			method: 'POST',
			body: importForm(bigCsv(20000))
		});
		expect(res.status).toBe(422);
		expect((await res.json()).error.code).toBe('too-slow');
		expect((await slow.anonymous().get('/api/health')).status).toBe(200);
		const sheet = await programmer.get(`/api/projects/${project}/sheets/patch.pdf`);
		expect(sheet.status).toBe(422);
	});

	it('stops a JSON backup check over budget: 422 as JSON, no project made, health still answers', async () => {
		const count = () =>
			slow
				.db()
				.select({ n: sql<number>`count(*)` })
				.from(projects)
				.get()!.n;
		const before = count();
		const res = await programmer.post('/api/projects/import-json', backup(2000, 'Over budget'));
		expect(res.status).toBe(422);
		expect(res.headers.get('content-type')).toContain('application/json');
		const body = await res.json();
		expect(body.error.code).toBe('too-slow');
		expect(body.error.message).toContain('nothing was written');
		expect(count()).toBe(before);
		expect((await slow.anonymous().get('/api/health')).status).toBe(200);
	});
});
