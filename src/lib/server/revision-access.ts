import { NotFoundError } from './errors';
import { parseId } from './authz';
import { getRevision, type RevisionRow } from './db/revisions';

/** The revision `n` of a project the caller already passed requireRole for; 404 otherwise. */
export function revisionOr404(projectId: number, n: string | undefined): RevisionRow {
	const number = parseId(n);
	const row = number === null ? undefined : getRevision(projectId, number);
	if (!row) throw new NotFoundError(`No revision ${n} in this project.`);
	return row;
}
