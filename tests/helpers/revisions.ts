import { and, asc, eq } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index';
import { fixtures, projects } from '../../src/lib/server/db/schema';
import { DEMO_PROJECT_NAME } from '../../src/lib/server/demo';
import type { TestServer } from './server';

// Helpers for the revision and review-link tests against the demo project.

export function demoProjectId(db: Db): number {
	return db.select({ id: projects.id }).from(projects).where(eq(projects.name, DEMO_PROJECT_NAME)).get()!.id;
}

/** The first two contiguously patched DMX fixtures of a project, by number. */
export function twoDmxFixtures(db: Db, projectId: number) {
	const rows = db
		.select()
		.from(fixtures)
		.where(and(eq(fixtures.projectId, projectId), eq(fixtures.controlKind, 'dmx')))
		.orderBy(asc(fixtures.number))
		.all();
	return [rows[0], rows[1]] as const;
}

export interface Mail {
	to: string;
	from: string;
	subject: string;
	text: string;
	html: string;
	date: string;
}

/** Polls the dev mail sink until `match` finds `count` mails, or gives up after a few seconds. */
export async function waitForMail(server: TestServer, match: (m: Mail) => boolean, count = 1): Promise<Mail[]> {
	const deadline = Date.now() + 8000;
	let found: Mail[] = [];
	while (Date.now() < deadline) {
		const res = await fetch(`${server.url}/dev/mail.json`);
		found = ((await res.json()) as Mail[]).filter(match);
		if (found.length >= count) return found;
		await new Promise((r) => setTimeout(r, 150));
	}
	return found;
}
