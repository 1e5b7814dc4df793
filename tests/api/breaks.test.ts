import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { BAR_XML, gdtfZip, TWO_BREAK_XML } from '../helpers/gdtf';
import { startServer, type TestServer } from '../helpers/server';

// A mode over several DMX breaks (DIN SPEC 15800 DMX mode / DMXChannel DMXBreak) through the API:
// GDTF import keeps break 2, a fixture gets a start address per break, the patch claims both.

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

const base = () => `/api/projects/${pid}`;

function importGdtf(xml: string, name: string, apply: boolean) {
	const form = new FormData();
	form.set('file', new Blob([new Uint8Array(gdtfZip(xml))]), name);
	if (apply) form.set('apply', 'true');
	return as.programmer.fetch(`${base()}/import`, { method: 'POST', body: form });
}

describe('DMX breaks through import, fixtures and the patch', () => {
	let typeId: number;
	let modeId: number;
	let u1: number;
	let u2: number;

	it('the import preview gives each break its footprint; a 12-cell bar previews as 48 slots', async () => {
		const bar = await (await importGdtf(BAR_XML, 'bar.gdtf', false)).json();
		expect(bar.modes).toEqual([{ name: 'Pixel RGBW', slots: 48, channels: 48 }]);
		const res = await importGdtf(TWO_BREAK_XML, 'twin.gdtf', true);
		expect(res.status).toBe(201);
		const body = await res.json();
		expect(body.modes).toEqual([
			{
				name: 'Split',
				slots: 6,
				channels: 4,
				breaks: [
					{ dmxBreak: 1, slots: 6 },
					{ dmxBreak: 2, slots: 4 }
				]
			}
		]);
		typeId = body.type.id;
		modeId = body.type.modes[0].id;
		expect(body.type.modes[0].breaks).toEqual(body.modes[0].breaks);
		expect(body.type.modes[0].channels[2]).toMatchObject({ parameter: 'green', offset: 1, dmxBreak: 2 });
	});

	it('a fixture takes a start address per break; GET /patch claims both and a one-break fixture keeps its shape', async () => {
		u1 = (await (await as.programmer.post(`${base()}/universes`, { number: 1, transport: 'sacn' })).json()).id;
		u2 = (await (await as.programmer.post(`${base()}/universes`, { number: 2, transport: 'sacn' })).json()).id;
		const control = { kind: 'dmx', universeId: u1, address: 1, breaks: [{ dmxBreak: 2, universeId: u2, address: 10 }] };
		const res = await as.programmer.post(`${base()}/fixtures`, { number: 1, typeId, modeId, control });
		expect(res.status).toBe(201);
		expect((await res.json()).control).toEqual(control);
		const patch = await (await as.viewer.get(`${base()}/patch`)).json();
		const f = patch.fixtures.find((x: { number: number }) => x.number === 1);
		expect(f.slots).toEqual([{ start: 1, end: 6 }]);
		expect(f.breakSlots).toEqual([{ dmxBreak: 2, footprint: 4, universeId: u2, ranges: [{ start: 10, end: 13 }] }]);
		const universe2 = patch.universes.find((u: { number: number }) => u.number === 2);
		expect(universe2).toMatchObject({ slotsUsed: 13, slotCount: 4 });
		expect(patch.conflicts).toEqual([]);
		// the CSV's range column carries break 2 after break 1
		const csv = await (await as.viewer.get(`${base()}/export.csv`)).text();
		expect(csv.split('\r\n').find((l) => l.startsWith('1,'))).toContain('1.1–6; break 2 2.10–13');
	});

	it('refuses a break the mode does not have and a break address that runs past 512', async () => {
		const bad = await as.programmer.post(`${base()}/fixtures`, {
			number: 2,
			typeId,
			modeId,
			control: {
				kind: 'dmx',
				universeId: u1,
				address: 20,
				breaks: [
					{ dmxBreak: 3, universeId: u2, address: 1 },
					{ dmxBreak: 2, universeId: u2, address: 510 }
				]
			}
		});
		expect(bad.status).toBe(400);
		const issues = (await bad.json()).error.issues.map((i: { path: unknown[] }) => i.path.join('.'));
		expect(issues).toEqual(['control.breaks.0.dmxBreak', 'control.breaks.1.address']);
	});

	it('a fixture without its second break address shows an out-of-range conflict naming the break', async () => {
		const res = await as.programmer.post(`${base()}/fixtures`, {
			number: 3,
			typeId,
			modeId,
			control: { kind: 'dmx', universeId: u1, address: 30 }
		});
		expect(res.status).toBe(201);
		expect((await res.json()).control).toEqual({ kind: 'dmx', universeId: u1, address: 30 });
		const { conflicts } = await (await as.viewer.get(`${base()}/conflicts`)).json();
		expect(conflicts.map((c: { kind: string; message: string }) => [c.kind, c.message])).toEqual([
			['out-of-range', 'Fixture 3 has no universe and address for DMX break 2 (4 slots) — give it one.']
		]);
	});

	function importCsv(csv: string, apply: boolean) {
		const form = new FormData();
		form.set('file', new Blob([csv], { type: 'text/csv' }), 'patch.csv');
		if (apply) form.set('apply', 'true');
		return as.programmer.fetch(`${base()}/import`, { method: 'POST', body: form });
	}

	it('the CSV export re-imports unchanged, and an edited range column moves break 2 (creating its universe)', async () => {
		const exported = await (await as.viewer.get(`${base()}/export.csv`)).text();
		const same = await importCsv(exported, false);
		expect(same.status).toBe(200);
		expect((await same.json()).update).toEqual([]);

		const moved = exported.replace('1.1–6; break 2 2.10–13', '1.1–6; break 2 3.20–23');
		expect(moved).not.toBe(exported);
		const preview = await (await importCsv(moved, false)).json();
		expect(preview.universes).toEqual([{ number: 3, name: 'Universe 3', action: 'create' }]);
		expect(preview.update.map((u: { number: number; changes: string[] }) => [u.number, u.changes])).toEqual([
			[1, ['patch → 1.1; break 2 3.20']]
		]);
		expect((await importCsv(moved, true)).status).toBe(201);
		const patch = await (await as.viewer.get(`${base()}/patch`)).json();
		const u3 = patch.universes.find((u: { number: number }) => u.number === 3).id;
		const f1 = patch.fixtures.find((f: { number: number }) => f.number === 1);
		expect(f1.control).toEqual({
			kind: 'dmx',
			universeId: u1,
			address: 1,
			breaks: [{ dmxBreak: 2, universeId: u3, address: 20 }]
		});
		expect(f1.breakSlots[0].ranges).toEqual([{ start: 20, end: 23 }]);
	});

	it('a "break 2" column patches a new fixture; a break running past 512 is refused naming the row and break', async () => {
		const head = 'number,maker,model,mode,universe,address,break 2';
		const ok = await importCsv(`${head}\n10,Ferncastle Lampworks,Twin Feed,Split,1,100,2.100`, true);
		expect(ok.status).toBe(201);
		expect((await ok.json()).create.map((c: { patch: string }) => c.patch)).toEqual(['1.100; break 2 2.100']);
		const fixture = (await (await as.viewer.get(`${base()}/fixtures`)).json()).fixtures.find(
			(f: { number: number }) => f.number === 10
		);
		expect(fixture.control.breaks).toEqual([{ dmxBreak: 2, universeId: u2, address: 100 }]);

		const bad = await importCsv(`${head}\n11,Ferncastle Lampworks,Twin Feed,Split,1,120,2.510`, true);
		expect(bad.status).toBe(422);
		const issues = (await bad.json()).error.issues;
		expect(issues).toEqual([{ row: 2, field: 'break 2', message: expect.stringContaining('past 512') }]);
		const numbers = (await (await as.viewer.get(`${base()}/fixtures`)).json()).fixtures.map(
			(f: { number: number }) => f.number
		);
		expect(numbers).not.toContain(11);
	});

	it('auto-address places break 2 following on, or on a universe of its own, around break slots already there', async () => {
		const made = await as.programmer.post(`${base()}/fixtures`, [
			{ number: 20, typeId, modeId },
			{ number: 21, typeId, modeId }
		]);
		expect(made.status).toBe(201);
		const ids = (await made.json()).fixtures.map((f: { id: number }) => f.id);
		const u4 = (await (await as.programmer.post(`${base()}/universes`, { number: 4 })).json()).id;
		const onward = await (
			await as.programmer.post(`${base()}/autopatch`, { fixtureIds: ids, universeId: u4, start: 1 })
		).json();
		// 6 slots of break 1 then 4 of break 2, fixture after fixture (DIN SPEC 15800 DMX mode: a footprint per break)
		expect(onward.placed).toEqual([
			{ fixtureId: ids[0], address: 1, breaks: [{ dmxBreak: 2, universeId: u4, address: 7 }] },
			{ fixtureId: ids[1], address: 11, breaks: [{ dmxBreak: 2, universeId: u4, address: 17 }] }
		]);
		// universe 2 already holds break 2 of fixture 1 (10–13) and fixture 10 (100–103)
		const own = await (
			await as.programmer.post(`${base()}/autopatch`, {
				fixtureIds: ids,
				universeId: u4,
				start: 1,
				breakUniverses: [{ dmxBreak: 2, universeId: u2 }],
				apply: true
			})
		).json();
		expect(own.placed).toEqual([
			{ fixtureId: ids[0], address: 1, breaks: [{ dmxBreak: 2, universeId: u2, address: 1 }] },
			{ fixtureId: ids[1], address: 7, breaks: [{ dmxBreak: 2, universeId: u2, address: 5 }] }
		]);
		const patch = await (await as.viewer.get(`${base()}/patch`)).json();
		const ours = patch.conflicts.filter((c: { fixtureIds: number[] }) => c.fixtureIds.some((i) => ids.includes(i)));
		expect(ours).toEqual([]);
		const f21 = patch.fixtures.find((f: { number: number }) => f.number === 21);
		expect(f21.control.breaks).toEqual([{ dmxBreak: 2, universeId: u2, address: 5 }]);

		const stray = await as.programmer.post(`${base()}/autopatch`, {
			fixtureIds: ids,
			universeId: u4,
			breakUniverses: [{ dmxBreak: 2, universeId: 999999 }]
		});
		expect(stray.status).toBe(400);
		expect((await stray.json()).error.issues[0].path).toEqual(['breakUniverses', 0, 'universeId']);
	});

	it("a universe used only by a fixture's break 2 is in use: delete names the fixture; detach sets it to manual", async () => {
		const u5 = (await (await as.programmer.post(`${base()}/universes`, { number: 5 })).json()).id;
		const made = await as.programmer.post(`${base()}/fixtures`, {
			number: 30,
			label: 'Split far',
			typeId,
			modeId,
			control: { kind: 'dmx', universeId: u1, address: 200, breaks: [{ dmxBreak: 2, universeId: u5, address: 1 }] }
		});
		expect(made.status).toBe(201);
		const id = (await made.json()).id;
		const refused = await as.programmer.fetch(`${base()}/universes/${u5}`, { method: 'DELETE' });
		expect(refused.status).toBe(409);
		const body = await refused.json();
		expect(body.error.message).toContain('fixture 30');
		expect(body.usedBy).toEqual([{ id, number: 30, label: 'Split far' }]);
		const detached = await as.programmer.fetch(`${base()}/universes/${u5}?detach=true`, { method: 'DELETE' });
		expect(detached.status).toBe(204);
		const after = (await (await as.viewer.get(`${base()}/fixtures`)).json()).fixtures.find(
			(f: { id: number }) => f.id === id
		);
		expect(after.control).toEqual({ kind: 'manual' });
	});

	it('refuses an address per parameter for a mode over two breaks, in a sentence saying what to do instead', async () => {
		const res = await as.programmer.post(`${base()}/fixtures`, {
			number: 40,
			typeId,
			modeId,
			control: { kind: 'dmx-map', universeId: u1, addresses: { intensity: 300, red: 305, green: 310 } }
		});
		expect(res.status).toBe(400);
		const { error } = await res.json();
		expect(error.issues).toEqual([
			{
				path: ['control', 'kind'],
				message:
					'Mode "Split" spans DMX breaks 1 and 2; an address per parameter covers one universe only, so give this fixture a start address per break instead.'
			}
		]);
		const numbers = (await (await as.viewer.get(`${base()}/fixtures`)).json()).fixtures.map(
			(f: { number: number }) => f.number
		);
		expect(numbers).not.toContain(40);
	});

	it('the fixture page saves a start address per break through the same checks as the API; refusals write nothing', async () => {
		const list = (await (await as.viewer.get(`${base()}/fixtures`)).json()).fixtures;
		const one = list.find((f: { number: number }) => f.number === 1);
		const post = (who: typeof as.programmer, fields: Record<string, string>) =>
			who.fetch(`/projects/${pid}/fixtures/1?/addresses`, {
				method: 'POST',
				headers: { 'content-type': 'application/x-www-form-urlencoded', 'x-sveltekit-action': 'true' },
				body: new URLSearchParams({ id: String(one.id), version: String(one.version), ...fields }).toString()
			});
		const current = () =>
			as.viewer
				.get(`${base()}/fixtures/${one.id}`)
				.then((r) => r.json() as Promise<{ control: unknown; version: number }>);

		const past = await post(as.programmer, {
			'universe-1': String(u1),
			'address-1': '50',
			'universe-2': String(u2),
			'address-2': '510'
		});
		const pastBody = await past.text();
		expect(pastBody).toContain('"type":"failure"');
		expect(pastBody).toContain(
			'This mode needs 4 slots; from address 510 it would run to slot 513, past 512. Start at 509 or lower.'
		);
		const blank = await (
			await post(as.programmer, { 'universe-1': String(u1), 'address-1': '50', 'universe-2': '', 'address-2': 'ten' })
		).text();
		expect(blank).toContain('Choose a universe for break 2.');
		expect(blank).toMatch(/ten\W{0,6} is not an address; write a number from 1 to 512\./);
		expect((await current()).control).toEqual(one.control);

		const electrician = await post(as.electrician, {
			'universe-1': String(u1),
			'address-1': '50',
			'universe-2': String(u2),
			'address-2': '200'
		});
		expect(electrician.status).toBe(403);
		expect((await current()).control).toEqual(one.control);

		const ok = await post(as.programmer, {
			'universe-1': String(u1),
			'address-1': '50',
			'universe-2': String(u2),
			'address-2': '200'
		});
		expect(await ok.text()).toContain('"type":"success"');
		const after = await current();
		expect(after.control).toEqual({
			kind: 'dmx',
			universeId: u1,
			address: 50,
			breaks: [{ dmxBreak: 2, universeId: u2, address: 200 }]
		});
		expect(after.version).toBe(one.version + 1);
	});
});
