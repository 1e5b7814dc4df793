import { db } from './index';
import { auditLog } from './schema';
import { insertMany } from './bulk';

export interface AuditEntry {
	projectId: number | null;
	userId: string | null;
	action: string;
	entity: string;
	entityId?: string | number | null;
	before?: unknown;
	after?: unknown;
}

/** Records who changed what; call inside the same transaction as the change. */
export function recordAudit(entry: AuditEntry): void {
	db()
		.insert(auditLog)
		.values({
			projectId: entry.projectId,
			userId: entry.userId,
			action: entry.action,
			entity: entry.entity,
			entityId: entry.entityId == null ? null : String(entry.entityId),
			before: entry.before ?? null,
			after: entry.after ?? null
		})
		.run();
}

/** Rows per multi-row INSERT: well under SQLite's 32,766 bound variables for our widest table. */
export const INSERT_CHUNK = 500;

/** Many audit entries through one prepared statement (bulk writes and imports); same transaction rule. */
export function recordAuditMany(entries: AuditEntry[]): void {
	const at = new Date();
	insertMany(
		auditLog,
		entries.map((entry) => ({
			projectId: entry.projectId,
			userId: entry.userId,
			action: entry.action,
			entity: entry.entity,
			entityId: entry.entityId == null ? null : String(entry.entityId),
			before: entry.before ?? null,
			after: entry.after ?? null,
			at
		}))
	);
}
