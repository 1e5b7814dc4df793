// npm run backup [-- <file>] — a consistent copy of the live database.
// Uses SQLite's online backup (through better-sqlite3), so it is safe while the
// server runs and writes: the copy is one point in time, never a torn file.
import Database from 'better-sqlite3';
import { existsSync, mkdirSync } from 'node:fs';
import { dirname, join, resolve } from 'node:path';
import { databasePath } from '../src/lib/server/db/index';

const source = databasePath();
if (!existsSync(source)) {
	console.error(`No database at ${source}; nothing to back up.`);
	process.exit(1);
}
const stamp = new Date().toISOString().replace(/[:.]/g, '-');
const target = resolve(process.argv[2] ?? join(dirname(source), 'backups', `patchwright-${stamp}.db`));
mkdirSync(dirname(target), { recursive: true });

const live = new Database(source, { fileMustExist: true });
live.pragma('busy_timeout = 5000');
await live.backup(target);
live.close();

const copy = new Database(target, { readonly: true });
const check = copy.pragma('integrity_check', { simple: true });
const projects = copy.prepare('select count(*) from project').pluck().get();
const fixtures = copy.prepare('select count(*) from fixture').pluck().get();
copy.close();
if (check !== 'ok') {
	console.error(`Backup written to ${target} but integrity_check says: ${String(check)}`);
	process.exit(1);
}
console.log(`Backup of ${source} written to ${target} (integrity ok; ${projects} projects, ${fixtures} fixtures).`);
