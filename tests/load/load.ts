// Mixed read/write load on the built server with the demo project, over loopback only.
// Usage: npx tsx tests/load/load.ts [seconds] [connections]   (npm run build first)
//
// Each connection loops: GET /patch, GET /conflicts, GET /fixtures, GET one fixture
// (its fresh version), PATCH that fixture's notes with that version. The fixture comes
// from a pool of spare manual fixtures (numbers 9001–9100, taken in turn), so two
// connections rarely hold the same one; when they do, the loser's 409 is the API doing
// its job and is counted apart — it is not an error. Errors are socket errors, timeouts
// and any 5xx; the run wants zero of them.
import autocannon from 'autocannon';
import { fileURLToPath } from 'node:url';
import { startServer } from '../helpers/server';

export interface LoadResult {
	seconds: number;
	connections: number;
	requests: number;
	rps: number;
	p50: number;
	p99: number;
	max: number;
	errors: number;
	timeouts: number;
	status5xx: number;
	status4xx: number;
	conflicts409: number;
	writesOk: number;
}

const POOL = 100;

export async function runLoad({ seconds = 20, connections = 50 } = {}): Promise<LoadResult> {
	const server = await startServer({ demo: true });
	try {
		const client = await server.signIn('programmer@demo.test');
		const projects = (await (await client.get('/api/projects')).json()).projects as { id: number }[];
		const pid = projects[0].id;
		const types = (await (await client.get(`/api/projects/${pid}/types`)).json()).types as {
			id: number;
			modes: { id: number }[];
		}[];
		const spare = Array.from({ length: POOL }, (_, i) => ({
			number: 9001 + i,
			label: `LOAD ${i + 1}`,
			typeId: types[0].id,
			modeId: types[0].modes[0].id
		}));
		const created = await client.post(`/api/projects/${pid}/fixtures`, spare);
		if (created.status !== 201)
			throw new Error(`could not create the spare fixtures: ${created.status} ${await created.text()}`);
		const pool = ((await created.json()).fixtures as { id: number }[]).map((f) => f.id);
		let next = 0;
		let writesOk = 0;
		let conflicts409 = 0;
		const headers = {
			cookie: [...client.cookies].map(([k, v]) => `${k}=${v}`).join('; '),
			origin: server.url,
			'content-type': 'application/json'
		};
		type Context = { id?: number; version?: number };
		const base = `/api/projects/${pid}`;
		const instance = autocannon({
			url: server.url,
			connections,
			duration: seconds,
			timeout: 10,
			headers,
			requests: [
				{ method: 'GET', path: `${base}/patch` },
				{ method: 'GET', path: `${base}/conflicts` },
				{ method: 'GET', path: `${base}/fixtures` },
				{
					method: 'GET',
					setupRequest: (req: Record<string, unknown>, context: Context) => {
						context.id = pool[next++ % pool.length];
						return { ...req, path: `${base}/fixtures/${context.id}` };
					},
					onResponse: (status: number, body: string, context: Context) => {
						if (status === 200) context.version = (JSON.parse(body) as { version: number }).version;
					}
				},
				{
					method: 'PATCH',
					setupRequest: (req: Record<string, unknown>, context: Context) => ({
						...req,
						path: `${base}/fixtures/${context.id}`,
						body: JSON.stringify({ notes: `load ${Date.now()}`, version: context.version })
					}),
					onResponse: (status: number) => {
						if (status === 200) writesOk++;
						if (status === 409) conflicts409++;
					}
				}
			]
		});
		const r = await instance;
		return {
			seconds,
			connections,
			requests: r.requests.total,
			rps: r.requests.average,
			p50: r.latency.p50,
			p99: r.latency.p99,
			max: r.latency.max,
			errors: r.errors,
			timeouts: r.timeouts,
			status5xx: r['5xx'],
			status4xx: r['4xx'],
			conflicts409,
			writesOk
		};
	} finally {
		await server.stop();
	}
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
	const [seconds, connections] = process.argv.slice(2).map(Number);
	const result = await runLoad({ seconds: seconds || 20, connections: connections || 50 });
	console.log(JSON.stringify(result, null, 2));
	if (result.errors || result.timeouts || result.status5xx || result.status4xx !== result.conflicts409)
		process.exitCode = 1;
}
