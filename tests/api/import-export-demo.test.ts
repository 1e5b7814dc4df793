import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { normaliseExport } from '../helpers/project-json';
import { startServer, type Client, type TestServer } from '../helpers/server';

// The demo is the richest patch we have (dmx, dmx-map, RC, a follower, link
// groups, a deliberate overlap): both exports must carry it back unchanged.

let server: TestServer;
let owner: Client;
let pid: number;

beforeAll(async () => {
	server = await startServer({ demo: true });
	owner = await server.signIn('owner@demo.test');
	pid = (await (await owner.get('/api/projects')).json()).projects[0].id;
});
afterAll(() => server?.stop());

describe('demo round trips', () => {
	it('JSON: the demo exported, restored as a new project and exported again is the same patch', async () => {
		const first = await (await owner.get(`/api/projects/${pid}/export.json`)).json();
		expect(first.fixtures).toHaveLength(46);
		const res = await owner.post('/api/projects/import-json', first);
		expect(res.status).toBe(201);
		const copy = (await res.json()).id;
		const second = await (await owner.get(`/api/projects/${copy}/export.json`)).json();
		expect(normaliseExport(second)).toEqual(normaliseExport(first));
		// same conflicts computed on both (the deliberate overlap survives)
		const conflicts = async (p: number) =>
			(await (await owner.get(`/api/projects/${p}/conflicts`)).json()).conflicts.map(
				(c: { kind: string; message: string }) => `${c.kind}: ${c.message}`
			);
		expect(await conflicts(copy)).toEqual(await conflicts(pid));
	});

	it('CSV: the exported patch imported back into the same project changes nothing', async () => {
		const csv = await (await owner.get(`/api/projects/${pid}/export.csv`)).text();
		const form = new FormData();
		form.set('file', new Blob([csv]), 'patch.csv');
		const res = await owner.fetch(`/api/projects/${pid}/import`, { method: 'POST', body: form });
		const summary = await res.json();
		expect(res.status).toBe(200);
		expect(summary).toMatchObject({ applied: false, rows: 46, create: [], update: [], universes: [] });
	});
});
