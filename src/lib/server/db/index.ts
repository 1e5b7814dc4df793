import Database from 'better-sqlite3';
import { drizzle, type BetterSQLite3Database } from 'drizzle-orm/better-sqlite3';
import { migrate } from 'drizzle-orm/better-sqlite3/migrator';
import { mkdirSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import * as schema from './schema';

export type Db = BetterSQLite3Database<typeof schema> & { $client: Database.Database };

export function databasePath(): string {
	return resolve(process.env.DATABASE_URL?.replace(/^file:/, '') || 'data/patchwright.db');
}

export function migrationsFolder(): string {
	return resolve(process.env.MIGRATIONS_DIR || 'drizzle');
}

/** Opens (creating if needed) a database file, sets the pragmas we rely on and applies migrations. */
export function openDatabase(path: string = databasePath()): Db {
	mkdirSync(dirname(path), { recursive: true });
	const sqlite = new Database(path);
	// WAL lets readers run beside the one writer; synchronous=FULL fsyncs every
	// commit so an acknowledged write survives power loss on set, not just a crash.
	sqlite.pragma('journal_mode = WAL');
	sqlite.pragma('synchronous = FULL');
	sqlite.pragma('foreign_keys = ON');
	sqlite.pragma('busy_timeout = 5000');
	const database = drizzle(sqlite, { schema }) as Db;
	migrate(database, { migrationsFolder: migrationsFolder() });
	return database;
}

let shared: Db | undefined;

/** The process-wide database, opened on first use (never at build time). */
export function db(): Db {
	shared ??= openDatabase();
	return shared;
}

/**
 * A statement built once per open database and reused: on the per-request reads (session, role,
 * project) drizzle's query builder and SQLite's prepare cost more than the query itself.
 */
export function prepared<T>(build: (database: Db) => T): () => T {
	let builtFor: Db | undefined;
	let statement: T | undefined;
	return () => {
		const database = db();
		if (builtFor !== database) {
			statement = build(database);
			builtFor = database;
		}
		return statement as T;
	};
}

export function closeDatabase(): void {
	shared?.$client.close();
	shared = undefined;
}

export { schema };
