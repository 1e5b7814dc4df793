import { db } from './index';
import { auditLog } from './schema';

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
