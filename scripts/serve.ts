// npm run serve — run the built app: migrations, demo seed, mail sink, then the server.
import { existsSync, readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { pathToFileURL } from 'node:url';
import { authSecret, mailSinkDir, publicBaseUrl, sinkPort } from '../src/lib/server/config';
import { closeDatabase, databasePath, openDatabase } from '../src/lib/server/db/index';
import { DEMO_PASSWORD, DEMO_USERS, isEmpty, seedDemo } from '../src/lib/server/demo';
import { startMailSink } from '../src/lib/server/mail/sink';

const host = (process.env.HOST ||= '127.0.0.1');
const port = (process.env.PORT ||= '3000');
process.env.ORIGIN ||= `http://${host === '0.0.0.0' ? '127.0.0.1' : host}:${port}`;
// photos and imports are bigger than adapter-node's 512 kB default; JSON routes keep their own 1 MB limit
process.env.BODY_SIZE_LIMIT ||= '30M';
authSecret();

const entry = resolve('build/index.js');
if (!existsSync(entry)) {
	console.error('No build found: run `npm run build` first (or `npm start`, which builds and serves).');
	process.exit(1);
}

const database = openDatabase();
if (process.env.PATCHWRIGHT_DEMO !== '0' && isEmpty(database)) {
	const { projectId } = await seedDemo(database);
	console.log(`Seeded the demo project (id ${projectId}).`);
}
database.$client.close();
closeDatabase();

if (!process.env.SMTP_URL) {
	const sink = await startMailSink(sinkPort(), mailSinkDir());
	// adapter-node closes its server on SIGTERM/SIGINT; the sink must go too or the process lingers
	process.once('sveltekit:shutdown', () => sink.close());
	console.log(`Mail sink on smtp://127.0.0.1:${sinkPort()} → ${mailSinkDir()} (see /dev/mail)`);
}

await memoiseMatchers();
await import(pathToFileURL(entry).href);
console.log(`Patchwright on ${publicBaseUrl()}  (database ${databasePath()})`);
if (process.env.PATCHWRIGHT_DEMO !== '0') {
	console.log(`Demo sign-ins, password "${DEMO_PASSWORD}":`);
	for (const u of DEMO_USERS) console.log(`  ${u.role.padEnd(12)} ${u.email}`);
}

/**
 * SvelteKit 2.70 memoises its page and endpoint imports but imports the route parameter matchers
 * (`[id=int]`) afresh on every request; under tsx's loader hooks each dynamic import is a round trip
 * to the hooks thread — an eighth of a signed-in /api/health in the issue-14 profile. The manifest is
 * one module instance shared with the handler, so memoising it here covers every request.
 */
async function memoiseMatchers(): Promise<void> {
	const chunks = resolve('build/server/chunks');
	const file = existsSync(chunks) ? readdirSync(chunks).find((f) => /^manifest\.js-.+\.js$/.test(f)) : undefined;
	if (!file) return;
	type Internal = { _?: { matchers?: () => Promise<unknown> } };
	const exported = Object.values((await import(pathToFileURL(join(chunks, file)).href)) as Record<string, Internal>);
	const internal = exported.find((v) => typeof v?._?.matchers === 'function')?._;
	if (!internal?.matchers) return;
	const load = internal.matchers;
	let once: Promise<unknown> | undefined;
	internal.matchers = () => (once ??= load());
}
