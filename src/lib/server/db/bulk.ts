import { getTableColumns, getTableName, type InferInsertModel } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import { db } from './index';

// Bulk writes (imports, restores): one prepared statement run once per row inside the caller's
// transaction. Building a query per row through the ORM cost more than SQLite's own work; the
// columns' own driver mapping (JSON, timestamps) is still used, so rows read back the same.
// (Multi-row VALUES statements were tried for the CSV import: slower than this, not faster.)

/** Inserts the rows (all with the same keys as the first) and answers their new ids, in order. */
export function insertMany<T extends SQLiteTable>(table: T, rows: InferInsertModel<T>[]): number[] {
	if (rows.length === 0) return [];
	const columns = getTableColumns(table) as Record<string, SQLiteColumn>;
	// a nullable column without a default that no row sets is left out: SQLite writes its null itself
	const keys = Object.keys(rows[0]).filter((k) => {
		const c = columns[k];
		if (c === undefined) return false;
		if (c.notNull || c.hasDefault) return true;
		for (const row of rows) if ((row as Record<string, unknown>)[k] != null) return true;
		return false;
	});
	const cols = keys.map((k) => columns[k]);
	const names = cols.map((c) => `"${c.name}"`).join(', ');
	const statement = db().$client.prepare(
		`insert into "${getTableName(table)}" (${names}) values (${keys.map(() => '?').join(', ')})`
	);
	// one array of values, refilled for each row, rather than one made per row
	const values: unknown[] = new Array(keys.length);
	const ids: number[] = new Array(rows.length);
	for (let i = 0; i < rows.length; i++) {
		const row = rows[i] as Record<string, unknown>;
		for (let c = 0; c < keys.length; c++) {
			const v = row[keys[c]];
			values[c] = v === null || v === undefined ? null : cols[c].mapToDriverValue(v);
		}
		ids[i] = Number(statement.run(values).lastInsertRowid);
	}
	return ids;
}
