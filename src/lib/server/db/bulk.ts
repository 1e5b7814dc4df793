import { getTableColumns, getTableName, type InferInsertModel } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import type { Statement } from 'better-sqlite3';
import { db } from './index';

// Bulk writes (imports, restores): prepared multi-row statements run inside the caller's transaction.
// Building a query per row through the ORM cost more than SQLite's own work, and so did one statement
// run per row (bind, step and reset 20,000 times); the columns' own driver mapping (JSON, timestamps)
// is still used, so rows read back the same.

/** rows per statement: the widest table (fixture, ~27 columns) stays far below SQLite's 32,766 parameters */
const ROWS_PER_STATEMENT = 64;

/** Inserts the rows (all with the same keys as the first) and answers their new ids, in order. */
export function insertMany<T extends SQLiteTable>(table: T, rows: InferInsertModel<T>[]): number[] {
	if (rows.length === 0) return [];
	const columns = getTableColumns(table) as Record<string, SQLiteColumn>;
	const keys = Object.keys(rows[0]).filter((k) => columns[k] !== undefined);
	const cols = keys.map((k) => columns[k]);
	const names = cols.map((c) => `"${c.name}"`).join(', ');
	const tuple = `(${keys.map(() => '?').join(', ')})`;
	const client = db().$client;
	const statements = new Map<number, Statement>();
	const statement = (n: number) => {
		let s = statements.get(n);
		if (!s) {
			s = client.prepare(
				`insert into "${getTableName(table)}" (${names}) values ${Array.from({ length: n }, () => tuple).join(', ')}`
			);
			statements.set(n, s);
		}
		return s;
	};
	// ids given in the rows are the rows' own; otherwise SQLite hands out rowids in insert order, one
	// statement's rows consecutively (the transaction holds the write lock), so its last id names them all
	const explicitId = keys.includes('id');
	const ids: number[] = new Array(rows.length);
	const values: unknown[] = [];
	for (let start = 0; start < rows.length; start += ROWS_PER_STATEMENT) {
		const n = Math.min(ROWS_PER_STATEMENT, rows.length - start);
		values.length = 0;
		for (let i = start; i < start + n; i++) {
			const row = rows[i] as Record<string, unknown>;
			for (let c = 0; c < keys.length; c++) {
				const v = row[keys[c]];
				values.push(v === null || v === undefined ? null : cols[c].mapToDriverValue(v));
			}
		}
		const result = statement(n).run(values);
		if (result.changes !== n)
			throw new Error(`insert into ${getTableName(table)} wrote ${result.changes} of ${n} rows`);
		const last = Number(result.lastInsertRowid);
		for (let i = 0; i < n; i++)
			ids[start + i] = explicitId ? Number((rows[start + i] as Record<string, unknown>).id) : last - n + 1 + i;
	}
	return ids;
}
