import { and, desc, eq, or, sql } from 'drizzle-orm';
import { db } from './index';
import { auditLog, users } from './schema';
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

export interface AuditRecord {
	id: number;
	action: string;
	by: string;
	at: Date;
	before: unknown;
	after: unknown;
}

/** One fixture's entries, newest first: its own changes, the import that created it, and the photos added to or removed from it. */
export function fixtureAudit(projectId: number, fixtureId: number, limit = 30): AuditRecord[] {
	const id = String(fixtureId);
	return db()
		.select({
			id: auditLog.id,
			action: auditLog.action,
			name: users.name,
			email: users.email,
			at: auditLog.at,
			before: auditLog.before,
			after: auditLog.after
		})
		.from(auditLog)
		.leftJoin(users, eq(users.id, auditLog.userId))
		.where(
			and(
				eq(auditLog.projectId, projectId),
				or(
					and(eq(auditLog.entity, 'fixture'), eq(auditLog.entityId, id)),
					and(
						eq(auditLog.entity, 'upload'),
						sql`coalesce(json_extract(${auditLog.after}, '$.fixtureId'), json_extract(${auditLog.before}, '$.fixtureId')) = ${fixtureId}`
					),
					// a CSV import records one entry for the file; it names the fixtures it created
					and(
						eq(auditLog.action, 'fixture.import'),
						sql`exists (select 1 from json_each(${auditLog.after}, '$.created') where json_extract(value, '$.id') = ${fixtureId})`
					)
				)
			)
		)
		.orderBy(desc(auditLog.at), desc(auditLog.id))
		.limit(limit)
		.all()
		.map((r) => ({
			id: r.id,
			action: r.action,
			by: r.name || r.email || 'a removed account',
			at: r.at,
			before: r.before,
			after: r.after
		}));
}
