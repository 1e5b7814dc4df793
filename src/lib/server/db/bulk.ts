import { getTableColumns, getTableName, type InferInsertModel } from 'drizzle-orm';
import type { SQLiteColumn, SQLiteTable } from 'drizzle-orm/sqlite-core';
import { db } from './index';

// Bulk writes (imports, restores): one prepared statement run once per row inside the caller's
// transaction. Building a query per row through the ORM cost more than SQLite's own work; the
// columns' own driver mapping (JSON, timestamps) is still used, so rows read back the same.

/** Inserts the rows (all with the same keys as the first) and answers their new ids, in order. */
export function insertMany<T extends SQLiteTable>(table: T, rows: InferInsertModel<T>[]): number[] {
	if (rows.length === 0) return [];
	const columns = getTableColumns(table) as Record<string, SQLiteColumn>;
	const keys = Object.keys(rows[0]).filter((k) => columns[k] !== undefined);
	const names = keys.map((k) => `"${columns[k].name}"`).join(', ');
	const statement = db().$client.prepare(
		`insert into "${getTableName(table)}" (${names}) values (${keys.map(() => '?').join(', ')})`
	);
	const ids: number[] = [];
	for (const row of rows) {
		const values = keys.map((k) => {
			const v = (row as Record<string, unknown>)[k];
			return v === null || v === undefined ? null : columns[k].mapToDriverValue(v);
		});
		ids.push(Number(statement.run(...values).lastInsertRowid));
	}
	return ids;
}
