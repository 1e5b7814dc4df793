import { createHash } from 'node:crypto';
import type { Db } from '../../src/lib/server/db/index';

// A full dump of one project's rows (and the global row counts a create could
// touch), hashed: a refused request must leave it identical ("no data is ever
// lost", and bad input writes nothing — not even an audit row).

const BY_PROJECT = [
	'membership',
	'invitation',
	'universe',
	'fixture_type',
	'receiver',
	'fixture',
	'upload',
	'revision',
	'review_link',
	'signoff',
	'audit_log'
];

export function fingerprint(db: Db, projectId: number): string {
	const sql = db.$client;
	const dump: Record<string, unknown> = {
		project: sql.prepare('select * from project where id = ?').all(projectId),
		totals: sql
			.prepare(
				'select (select count(*) from project) projects, (select count(*) from user) users, (select count(*) from upload) uploads'
			)
			.get(),
		mode: sql
			.prepare('select * from mode where type_id in (select id from fixture_type where project_id = ?) order by id')
			.all(projectId),
		mode_channel: sql
			.prepare(
				'select * from mode_channel where mode_id in (select m.id from mode m join fixture_type t on t.id = m.type_id where t.project_id = ?) order by rowid'
			)
			.all(projectId),
		receiver_label: sql
			.prepare(
				'select * from receiver_label where receiver_id in (select id from receiver where project_id = ?) order by rowid'
			)
			.all(projectId)
	};
	for (const table of BY_PROJECT) {
		const hasProject =
			(
				sql.prepare(`select count(*) n from pragma_table_info('${table}') where name = 'project_id'`).get() as {
					n: number;
				}
			).n > 0;
		// mail_outbox has no project column: count it globally (an invitation writes one)
		dump[table] = hasProject
			? sql.prepare(`select * from ${table} where project_id = ? order by rowid`).all(projectId)
			: sql.prepare(`select count(*) n from ${table}`).get();
	}
	// the mail a project's requests queued; not its delivery state, which the background sender
	// changes after the answer (sent, attempts, next try)
	dump.mail_outbox = sql
		.prepare('select id, "to", subject, text, kind from mail_outbox where project_id = ? order by id')
		.all(projectId);
	return createHash('sha256').update(JSON.stringify(dump)).digest('hex');
}
