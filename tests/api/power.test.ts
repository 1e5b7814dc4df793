import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { makeCrew, signInCrew } from '../helpers/factories';
import { startServer, type TestServer } from '../helpers/server';

// Pack types, circuits, fixture feeds and GET …/power (issue 15): shapes, validation, roles,
// stale versions, in-use refusals, and the computed figures end to end.

let server: TestServer;
let pid: number;
let otherPid: number;
let as: Awaited<ReturnType<typeof signInCrew>>;

beforeAll(async () => {
	server = await startServer();
	const { project, crew, outsider } = await makeCrew(server.db());
	pid = project.id;
	as = await signInCrew(server, crew, outsider);
	otherPid = (await makeCrew(server.db())).project.id;
});
afterAll(() => server?.stop());

const base = () => `/api/projects/${pid}`;
const SIX_CELL = { name: 'Six-cell 4.5 Ah', chemistry: 'li-ion', cells: 6, ampHours: 4.5, maxCurrentA: 8 };

async function typeWithDraw(watts: number, inputVolts?: { min: number; max: number }) {
	const res = await as.programmer.post(`${base()}/types`, {
		maker: 'Testworks',
		model: `Panel ${watts} W ${Math.random()}`,
		drawFloor: 0.2,
		modes: [{ name: '1ch', channels: [{ offset: 1, parameter: 'intensity', bits: 8 }], watts, inputVolts }]
	});
	expect(res.status).toBe(201);
	const t = await res.json();
	expect(t.modes[0].watts).toBe(watts);
	return { typeId: t.id, modeId: t.modes[0].id };
}

let fixtureNumber = 10;
async function fixture(t: { typeId: number; modeId: number }, extra: Record<string, unknown> = {}) {
	const res = await as.programmer.post(`${base()}/fixtures`, { number: fixtureNumber++, ...t, ...extra });
	expect(res.status).toBe(201);
	return res.json();
}

describe('pack types', () => {
	it('creates, reads, patches (version-checked) and deletes a pack type; roles decide who may write', async () => {
		const created = await as.programmer.post(`${base()}/pack-types`, SIX_CELL);
		expect(created.status).toBe(201);
		const p = await created.json();
		expect(p).toMatchObject({ ...SIX_CELL, wattHours: null, onHand: 0, chargers: 1, chargerBays: 1, version: 1 });
		expect((await as.electrician.post(`${base()}/pack-types`, SIX_CELL)).status).toBe(403);
		expect((await as.viewer.patch(`${base()}/pack-types/${p.id}`, { onHand: 3, version: 1 })).status).toBe(403);
		expect((await as.outsider.get(`${base()}/pack-types/${p.id}`)).status).toBe(404);
		expect((await as.viewer.get(`${base()}/pack-types/${p.id}`)).status).toBe(200);
		// giving Wh replaces Ah: one derives the other
		const patched = await as.programmer.patch(`${base()}/pack-types/${p.id}`, { wattHours: 98, version: 1 });
		expect(patched.status).toBe(200);
		expect(await patched.json()).toMatchObject({ wattHours: 98, ampHours: null, version: 2 });
		const stale = await as.programmer.patch(`${base()}/pack-types/${p.id}`, { onHand: 2, version: 1 });
		expect(stale.status).toBe(409);
		expect((await stale.json()).current.version).toBe(2);
		expect((await as.programmer.delete(`${base()}/pack-types/${p.id}?version=1`)).status).toBe(409);
		expect((await as.programmer.delete(`${base()}/pack-types/${p.id}?version=2`)).status).toBe(204);
		expect((await as.viewer.get(`${base()}/pack-types/${p.id}`)).status).toBe(404);
	});

	it('refuses bad packs with 400 and field issues, writing nothing', async () => {
		const before = (await (await as.viewer.get(`${base()}/pack-types`)).json()).packTypes.length;
		const cases: [unknown, string][] = [
			[{ ...SIX_CELL, cells: 15 }, 'cells'],
			[{ ...SIX_CELL, chemistry: 'nicd' }, 'chemistry'],
			[{ ...SIX_CELL, ampHours: undefined }, 'ampHours'],
			[{ ...SIX_CELL, wattHours: 97.2 }, 'wattHours'],
			[{ ...SIX_CELL, maxCurrentA: 0 }, 'maxCurrentA'],
			[{ ...SIX_CELL, brand: 'x' }, '']
		];
		for (const [body, field] of cases) {
			const res = await as.programmer.post(`${base()}/pack-types`, body);
			expect(res.status, JSON.stringify(body)).toBe(400);
			const err = (await res.json()).error;
			if (field) expect(err.issues.map((i: { path: string[] }) => i.path[0])).toContain(field);
		}
		expect((await (await as.viewer.get(`${base()}/pack-types`)).json()).packTypes.length).toBe(before);
	});
});

describe('circuits', () => {
	it('creates with the 0.9 power factor by default, patches, and refuses a stale write', async () => {
		const res = await as.programmer.post(`${base()}/circuits`, { name: 'Stage left', volts: 120, breakerA: 20 });
		expect(res.status).toBe(201);
		const c = await res.json();
		expect(c).toMatchObject({ volts: 120, breakerA: 20, powerFactor: 0.9, version: 1 });
		expect((await as.electrician.patch(`${base()}/circuits/${c.id}`, { breakerA: 30, version: 1 })).status).toBe(403);
		const ok = await as.programmer.patch(`${base()}/circuits/${c.id}`, { breakerA: 30, version: 1 });
		expect(await ok.json()).toMatchObject({ breakerA: 30, version: 2 });
		expect((await as.programmer.patch(`${base()}/circuits/${c.id}`, { breakerA: 20, version: 1 })).status).toBe(409);
		expect(
			(await as.programmer.post(`${base()}/circuits`, { name: 'x', volts: 120, breakerA: 20, powerFactor: 2 })).status
		).toBe(400);
		expect((await as.programmer.get(`/api/projects/${otherPid}/circuits`)).status).toBe(404);
	});
});

describe('feeds and the power figures', () => {
	it('feeds fixtures, computes current, runtime, circuit load and the rotation, and refuses a foreign feed', async () => {
		const pack = await (await as.programmer.post(`${base()}/pack-types`, { ...SIX_CELL, onHand: 1 })).json();
		const circuit = await (
			await as.programmer.post(`${base()}/circuits`, { name: 'Dimmer city', volts: 120, breakerA: 20 })
		).json();
		const panel = await typeWithDraw(150, { min: 12, max: 30 });
		const par = await typeWithDraw(900);
		const f1 = await fixture(panel, { feed: { kind: 'battery', packTypeId: pack.id } });
		expect(f1.feed).toEqual({ kind: 'battery', packTypeId: pack.id });
		const f2 = await fixture(par, { feed: { kind: 'mains', circuitId: circuit.id } });
		const f3 = await fixture(par);
		expect(f3.feed).toEqual({ kind: 'none' });
		// a feed into another project's pack type is refused and writes nothing
		const other = await as.programmer.patch(`${base()}/fixtures/${f3.id}`, {
			feed: { kind: 'battery', packTypeId: 999999 },
			version: f3.version
		});
		expect(other.status).toBe(400);
		expect((await other.json()).error.issues[0].path).toEqual(['feed', 'packTypeId']);
		const moved = await as.programmer.patch(`${base()}/fixtures/${f3.id}`, {
			feed: { kind: 'mains', circuitId: circuit.id },
			version: f3.version
		});
		expect(moved.status).toBe(200);

		const res = await as.viewer.get(`${base()}/power`);
		expect(res.status).toBe(200);
		const power = await res.json();
		const p = power.packTypes.find((x: { id: number }) => x.id === pack.id);
		// 6 × 3.6 V = 21.6 V; 4.5 Ah × 21.6 V = 97.2 Wh (cell voltages: common practice)
		expect(p).toMatchObject({ nominalVolts: 21.6, wattHours: 97.2, maxCurrentA: 8 });
		// 150 W ÷ 18.0 V (6 × 3.0 V end of discharge) = 8.333 A > 8 A; 97.2 × 0.85 ÷ 150 W × 60 = 33.05 min
		expect(p.fixtures[0]).toMatchObject({ fixtureId: f1.id, drawW: 150, currentA: 8.333 });
		expect(p.fixtures[0].runtimeMin).toBeCloseTo(33.05, 1);
		expect(p.warnings.map((w: { code: string }) => w.code)).toEqual(['over-current']);
		const c = power.circuits.find((x: { id: number }) => x.id === circuit.id);
		// 1800 W ÷ (120 V × 0.9) = 16.67 A = 83.3 % of 20 A: above 80 % (NEC 210.19(A)/210.20(A) practice)
		expect(c).toMatchObject({ loadW: 1800, fixtureIds: [f2.id, f3.id], percentOfBreaker: 83.3 });
		expect(c.warnings.map((w: { code: string }) => w.code)).toEqual(['circuit-over-80']);
		// one pack, no charge time: the fixture goes dark 33 min after the 08:00 start
		expect(power.day).toMatchObject({ start: '08:00', wrap: '20:00' });
		expect(power.day.shortfalls).toEqual([
			expect.objectContaining({ fixtureId: f1.id, darkAt: '08:33', packsShort: expect.any(Number) })
		]);

		// deleting a pack type in use is refused; ?detach=true sets the feed to none
		const refused = await as.programmer.delete(`${base()}/pack-types/${pack.id}`);
		expect(refused.status).toBe(409);
		expect((await refused.json()).usedBy.map((u: { id: number }) => u.id)).toEqual([f1.id]);
		expect((await as.programmer.delete(`${base()}/pack-types/${pack.id}?detach=true`)).status).toBe(204);
		const after = await (await as.viewer.get(`${base()}/fixtures/${f1.id}`)).json();
		expect(after.feed).toEqual({ kind: 'none' });
	});

	it('the day settings are version-checked and validated', async () => {
		const project = await (await as.viewer.get(base())).json();
		const bad = await as.programmer.patch(`${base()}/power`, { dayStart: '25:00', version: project.version });
		expect(bad.status).toBe(400);
		expect(
			(await as.electrician.patch(`${base()}/power`, { dayStart: '07:00', version: project.version })).status
		).toBe(403);
		const ok = await as.programmer.patch(`${base()}/power`, {
			dayStart: '07:00',
			dayWrap: '19:00',
			usableFraction: 0.8,
			version: project.version
		});
		expect(ok.status).toBe(200);
		expect(await ok.json()).toMatchObject({ dayStart: '07:00', dayWrap: '19:00', usableFraction: 0.8 });
		expect((await as.programmer.patch(`${base()}/power`, { dayStart: '06:00', version: project.version })).status).toBe(
			409
		);
	});
});

describe('power sheet', () => {
	it('prints the packs, the shortfalls and the circuits as a PDF any member may read', async () => {
		const res = await as.viewer.get(`${base()}/sheets/power.pdf`);
		expect(res.status).toBe(200);
		expect(res.headers.get('content-type')).toBe('application/pdf');
		const bytes = new Uint8Array(await res.arrayBuffer());
		// a PDF starts with its version header (ISO 32000-1 §7.5.2)
		expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
		expect((await as.outsider.get(`${base()}/sheets/power.pdf`)).status).toBe(404);
		expect((await as.viewer.get(`${base()}/sheets/power.pdf?paper=tabloid`)).status).toBe(400);
	});
});
