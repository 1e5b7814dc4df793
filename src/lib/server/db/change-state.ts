import { randomBytes } from 'node:crypto';
import type { Database, Statement } from 'better-sqlite3';
import { db } from './index';

// What this connection can tell about writes to the database file, for work kept until the next write
// (the computed patch, kept page renders, session checks, an import's checked plan):
// `committedElsewhere()` changes whenever another connection (the request loop, another worker
// thread, another process) commits; `ownChanges()` whenever this connection writes, rolled back or
// not; `changeKey()` names both at once. The epoch names the connection, so a reopened one never matches.

interface Counters {
	client: Database;
	epoch: string;
	dataVersion: Statement;
	totalChanges: Statement;
}

let counters: Counters | undefined;

function theCounters(): Counters {
	const client = db().$client;
	// prepared once per connection: better-sqlite3's pragma() prepares its statement anew on every call
	if (counters?.client !== client)
		counters = {
			client,
			epoch: randomBytes(6).toString('base64url'),
			dataVersion: client.prepare('pragma data_version').pluck(),
			totalChanges: client.prepare('select total_changes()').pluck()
		};
	return counters;
}

/** This connection and the commits of every other one it has seen (PRAGMA data_version). */
export function committedElsewhere(): string {
	const c = theCounters();
	return `${c.epoch}.${String(c.dataVersion.get())}`;
}

/** Rows this connection has inserted, updated or deleted since it opened, rolled back or not. */
export function ownChanges(): number {
	return Number(theCounters().totalChanges.get());
}

/** Names the database state: moves with every write by this connection or any other one. */
export function changeKey(): string {
	const c = theCounters();
	return `${c.epoch}.${String(c.dataVersion.get())}.${String(c.totalChanges.get())}`;
}
