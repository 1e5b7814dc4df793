import { spawn, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import { createServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { openDatabase, type Db } from '../../src/lib/server/db/index';

// Starts the built server (npm run build first) on free loopback ports with a
// fresh SQLite file and its own mail sink, exactly as `npm run serve` does.

/**
 * Free loopback ports, all different: each is held open until all are chosen, because a port closed
 * straight away can be handed out again at once (the web server and its mail sink once drew the same
 * one and the server failed to start with EADDRINUSE).
 */
export async function freePorts(count: number): Promise<number[]> {
	const held = await Promise.all(
		Array.from(
			{ length: count },
			() =>
				new Promise<ReturnType<typeof createServer>>((res, rej) => {
					const srv = createServer();
					srv.once('error', rej);
					srv.listen(0, '127.0.0.1', () => res(srv));
				})
		)
	);
	const ports = held.map((srv) => {
		const address = srv.address();
		return typeof address === 'object' && address ? address.port : 0;
	});
	await Promise.all(held.map((srv) => new Promise((res) => srv.close(res))));
	return ports;
}

export function freePort(): Promise<number> {
	return new Promise((res, rej) => {
		const srv = createServer();
		srv.once('error', rej);
		srv.listen(0, '127.0.0.1', () => {
			const address = srv.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			srv.close(() => res(port));
		});
	});
}

export interface TestServer {
	url: string;
	dir: string;
	dbPath: string;
	mailDir: string;
	uploadsDir: string;
	process: ChildProcess;
	/** Opens the server's database file for factories and checks (WAL allows both). */
	db(): Db;
	signIn(email: string, password?: string): Promise<Client>;
	anonymous(): Client;
	stop(): Promise<void>;
	output(): string;
}

export interface StartOptions {
	demo?: boolean;
	env?: Record<string, string>;
	/** reuse an existing directory (restart after a crash) */
	dir?: string;
}

export async function startServer(options: StartOptions = {}): Promise<TestServer> {
	const dir = options.dir ?? mkdtempSync(join(tmpdir(), 'patchwright-test-'));
	const [port, smtpPort] = await freePorts(2);
	const url = `http://127.0.0.1:${port}`;
	const dbPath = join(dir, 'test.db');
	const mailDir = join(dir, 'mail');
	const uploadsDir = join(dir, 'uploads');
	const child = spawn(process.execPath, ['--import', 'tsx', resolve('scripts/serve.ts')], {
		cwd: resolve('.'),
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: url,
			PUBLIC_BASE_URL: url,
			DATABASE_URL: dbPath,
			SMTP_PORT: String(smtpPort),
			SMTP_URL: '',
			MAIL_SINK_DIR: mailDir,
			UPLOADS_DIR: uploadsDir,
			AUTH_SECRET: randomBytes(32).toString('base64url'),
			PATCHWRIGHT_DEMO: options.demo ? '1' : '0',
			PATCHWRIGHT_RATE_SCALE: '1000',
			// outlive the client's own 4 s idle timeout, so a loaded machine never races a closing socket (ECONNRESET)
			KEEP_ALIVE_TIMEOUT: '65',
			...options.env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let log = '';
	child.stdout?.on('data', (d: Buffer) => (log += d.toString()));
	child.stderr?.on('data', (d: Buffer) => (log += d.toString()));
	let exited = false;
	child.once('exit', () => (exited = true));

	const deadline = Date.now() + 30_000;
	for (;;) {
		if (exited) throw new Error(`server exited during start:\n${log}`);
		try {
			const res = await fetch(`${url}/api/health`);
			if (res.ok) break;
		} catch {
			/* not listening yet */
		}
		if (Date.now() > deadline) {
			child.kill('SIGKILL');
			throw new Error(`server did not start in 30 s:\n${log}`);
		}
		await new Promise((r) => setTimeout(r, 100));
	}

	let database: Db | undefined;
	return {
		url,
		dir,
		dbPath,
		mailDir,
		uploadsDir,
		process: child,
		db() {
			database ??= openDatabase(dbPath);
			return database;
		},
		async signIn(email, password = 'patchwright-demo') {
			const client = new Client(url);
			await client.signIn(email, password);
			return client;
		},
		anonymous: () => new Client(url),
		output: () => log,
		async stop() {
			database?.$client.close();
			database = undefined;
			if (!exited) {
				const gone = new Promise((r) => child.once('exit', r));
				child.kill('SIGTERM');
				await Promise.race([gone, new Promise((r) => setTimeout(r, 5000))]);
				if (!exited) child.kill('SIGKILL');
			}
			if (!options.dir) rmSync(dir, { recursive: true, force: true });
		}
	};
}

/** A cookie-keeping HTTP client that sends the Origin header a browser would. */
export class Client {
	cookies = new Map<string, string>();

	constructor(public base: string) {}

	private cookieHeader() {
		return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
	}

	private keep(res: Response) {
		for (const line of res.headers.getSetCookie()) {
			const [pair] = line.split(';');
			const eq = pair.indexOf('=');
			const name = pair.slice(0, eq).trim();
			const value = pair.slice(eq + 1).trim();
			if (!value || /max-age=0/i.test(line) || /expires=thu, 01 jan 1970/i.test(line)) this.cookies.delete(name);
			else this.cookies.set(name, value);
		}
	}

	async fetch(path: string, init: RequestInit = {}): Promise<Response> {
		const headers = new Headers(init.headers);
		headers.set('origin', this.base);
		if (this.cookies.size) headers.set('cookie', this.cookieHeader());
		const res = await fetch(new URL(path, this.base), { ...init, headers, redirect: 'manual' });
		this.keep(res);
		return res;
	}

	json(method: string, path: string, body?: unknown): Promise<Response> {
		return this.fetch(path, {
			method,
			headers: body === undefined ? {} : { 'content-type': 'application/json' },
			body: body === undefined ? undefined : JSON.stringify(body)
		});
	}

	get = (path: string) => this.fetch(path);
	post = (path: string, body?: unknown) => this.json('POST', path, body);
	patch = (path: string, body?: unknown) => this.json('PATCH', path, body);
	delete = (path: string) => this.json('DELETE', path);

	form(path: string, fields: Record<string, string>): Promise<Response> {
		return this.fetch(path, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html' },
			body: new URLSearchParams(fields).toString()
		});
	}

	/** Signs in through Auth.js's credentials callback, as the sign-in form does. */
	async signIn(email: string, password: string): Promise<void> {
		const res = await this.form('/auth/callback/credentials', { email, password, callbackUrl: '/' });
		const location = res.headers.get('location') ?? '';
		if (res.status !== 302 || location.includes('error=')) {
			throw new Error(`sign-in as ${email} failed: ${res.status} ${location}`);
		}
	}

	async session(): Promise<{ user?: { email?: string; id?: string } } | null> {
		const res = await this.get('/auth/session');
		return (await res.json()) as { user?: { email?: string; id?: string } } | null;
	}
}
