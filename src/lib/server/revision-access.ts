import type { DescribedChanges, PatchDiff } from '../patch/index';
import { InvalidError, NotFoundError } from './errors';
import { parseId } from './authz';
import { diffSnapshots, getRevision, liveSnapshot, snapshotOf, type RevisionRow } from './db/revisions';

/** The revision `n` of a project the caller already passed requireRole for; 404 otherwise. */
export function revisionOr404(projectId: number, n: string | undefined): RevisionRow {
	const number = parseId(n);
	const row = number === null ? undefined : getRevision(projectId, number);
	if (!row) throw new NotFoundError(`No revision ${n} in this project.`);
	return row;
}

export type RevisionDiff = PatchDiff & { changes: DescribedChanges } & {
	before: { revision: number };
	after: { revision: number | 'live' };
};

/**
 * What changed from revision `against` to revision `n`, or (`against` = 'live') in the draft since
 * revision `n`. GET …/revisions/:n/diff and the revisions page both answer this.
 */
export function revisionDiff(projectId: number, n: string | undefined, against: string | null): RevisionDiff {
	const row = revisionOr404(projectId, n);
	if (!against) throw new InvalidError('Say what to compare with: ?against=<revision number> or ?against=live.');
	if (against === 'live') {
		return {
			before: { revision: row.number },
			after: { revision: 'live' },
			...diffSnapshots(snapshotOf(row), liveSnapshot(projectId))
		};
	}
	const other = revisionOr404(projectId, against);
	return {
		before: { revision: other.number },
		after: { revision: row.number },
		...diffSnapshots(snapshotOf(other), snapshotOf(row))
	};
}
