import { and, asc, eq, sql } from 'drizzle-orm';
import { assignRc, defaultChannelCount, type AssignRcResult } from '../../patch/index';
import { recordAudit } from './audit';
import { InUseError, InvalidError, NotFoundError, StaleVersionError } from '../errors';
import { db } from './index';
import { listReceivers, listTypes, receiverShape, type ReceiverShape } from './patch';
import { fixtures, receiverLabels, receivers } from './schema';
import { detachFixture } from './universes';
import type { ReceiverCreate, ReceiverPatch } from '../../schemas/receiver';

export function getReceiver(projectId: number, id: number): ReceiverShape | undefined {
	return listReceivers(projectId).find((r) => r.id === id);
}

function requireRow(projectId: number, id: number) {
	const row = db()
		.select()
		.from(receivers)
		.where(and(eq(receivers.id, id), eq(receivers.projectId, projectId)))
		.get();
	if (!row) throw new NotFoundError('No such receiver in this project.');
	return row;
}

function writeLabels(receiverId: number, labels: Record<string, string>): void {
	db().delete(receiverLabels).where(eq(receiverLabels.receiverId, receiverId)).run();
	const rows = Object.entries(labels).map(([channel, label]) => ({ receiverId, channel: Number(channel), label }));
	if (rows.length > 0) db().insert(receiverLabels).values(rows).run();
}

function labelsBeyond(protocol: ReceiverShape['protocol'], labels: Record<string, string>): void {
	const count = defaultChannelCount(protocol);
	const beyond = Object.keys(labels).filter((k) => Number(k) > count);
	if (beyond.length > 0) {
		throw new InvalidError(
			`A ${protocol} receiver has channels 1–${count}; labels for ${beyond.join(', ')} do not fit.`,
			beyond.map((k) => ({ path: ['labels', k], message: `${protocol} has channels 1–${count}.` }))
		);
	}
}

export function createReceiver(projectId: number, userId: string, input: ReceiverCreate): ReceiverShape {
	return db().transaction(() => {
		const { labels, ...fields } = input;
		labelsBeyond(fields.protocol, labels);
		const row = db()
			.insert(receivers)
			.values({ projectId, ...fields })
			.returning()
			.get();
		writeLabels(row.id, labels);
		const shape = receiverShape(row, labels);
		recordAudit({ projectId, userId, action: 'receiver.create', entity: 'receiver', entityId: row.id, after: shape });
		return shape;
	});
}

export function updateReceiver(projectId: number, userId: string, id: number, patch: ReceiverPatch): ReceiverShape {
	return db().transaction(() => {
		requireRow(projectId, id);
		const before = getReceiver(projectId, id)!;
		const { version, labels, ...fields } = patch;
		if (before.version !== version) throw new StaleVersionError(before);
		const protocol = fields.protocol ?? before.protocol;
		// Labels are replaced as a whole; a protocol change must still fit the labels kept.
		labelsBeyond(protocol, labels ?? before.labels);
		const changed = db()
			.update(receivers)
			.set({ ...fields, version: sql`${receivers.version} + 1`, updatedAt: new Date() })
			.where(and(eq(receivers.id, id), eq(receivers.version, version)))
			.run().changes;
		if (changed !== 1) throw new StaleVersionError(getReceiver(projectId, id));
		if (labels !== undefined) writeLabels(id, labels);
		const after = getReceiver(projectId, id)!;
		recordAudit({ projectId, userId, action: 'receiver.update', entity: 'receiver', entityId: id, before, after });
		return after;
	});
}

export function deleteReceiver(projectId: number, userId: string, id: number, detach: boolean): void {
	db().transaction(() => {
		requireRow(projectId, id);
		const before = getReceiver(projectId, id)!;
		const users = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), eq(fixtures.receiverId, id)))
			.orderBy(asc(fixtures.number))
			.all();
		if (users.length > 0 && !detach) {
			throw new InUseError(
				`Receiver "${before.name}" drives ${users.length === 1 ? 'fixture' : 'fixtures'} ${users.map((f) => f.number).join(', ')}; move them first or delete with ?detach=true to set them to manual.`,
				users.map((f) => ({ id: f.id, number: f.number, label: f.label }))
			);
		}
		for (const f of users) detachFixture(projectId, userId, f, `receiver "${before.name}" deleted`);
		db().delete(receivers).where(eq(receivers.id, id)).run();
		recordAudit({ projectId, userId, action: 'receiver.delete', entity: 'receiver', entityId: id, before });
	});
}

export interface AssignOptions {
	fixtureIds?: number[];
	keepExisting: boolean;
	apply: boolean;
}

/**
 * The engine's assignRc over the RC fixtures of one receiver. With fixtureIds only those are
 * (re)assigned: the others keep their channels and the engine treats them as taken.
 */
export function assignReceiver(
	projectId: number,
	userId: string,
	id: number,
	o: AssignOptions
): AssignRcResult & { applied: boolean } {
	return db().transaction(() => {
		const receiver = requireRow(projectId, id);
		const rows = db()
			.select()
			.from(fixtures)
			.where(and(eq(fixtures.projectId, projectId), eq(fixtures.receiverId, id), eq(fixtures.controlKind, 'rc')))
			.all();
		const chosen = new Set(o.fixtureIds ?? rows.map((f) => f.id));
		const known = new Set(rows.map((f) => f.id));
		const stray = [...chosen].filter((f) => !known.has(f));
		if (stray.length > 0) {
			throw new InvalidError(`Fixture ids ${stray.join(', ')} are not on RC through this receiver.`, [
				{ path: ['fixtureIds'], message: `Not RC fixtures of receiver "${receiver.name}": ${stray.join(', ')}.` }
			]);
		}
		const modeParams = new Map<number, string[]>();
		for (const t of listTypes(projectId))
			for (const m of t.modes) modeParams.set(m.id, [...new Set(m.channels.map((c) => c.parameter))]);
		const partial = o.fixtureIds !== undefined;
		const result = assignRc({
			receiver: { id: receiver.id, protocol: receiver.protocol, name: receiver.name },
			// unchosen fixtures keep what they have, so the pass must keep existing channels for them
			keepExisting: o.keepExisting || partial,
			fixtures: rows.map((f) => ({
				id: f.id,
				number: f.number,
				linkGroup: f.linkGroup,
				parameters: modeParams.get(f.modeId) ?? [],
				channels: chosen.has(f.id) && partial && !o.keepExisting ? {} : (f.rcChannels ?? {})
			}))
		});
		const assigned = result.assigned.filter((a) => chosen.has(a.fixtureId));
		const unassigned = result.unassigned.filter((a) => chosen.has(a.fixtureId));
		if (o.apply) {
			const byFixture = new Map<number, Record<string, number>>();
			for (const a of assigned) {
				const map = byFixture.get(a.fixtureId) ?? {};
				map[a.parameter] = a.channel;
				byFixture.set(a.fixtureId, map);
			}
			for (const f of rows) {
				if (!chosen.has(f.id)) continue;
				const channels = byFixture.get(f.id) ?? {};
				db()
					.update(fixtures)
					.set({ rcChannels: channels, version: sql`${fixtures.version} + 1`, updatedAt: new Date() })
					.where(eq(fixtures.id, f.id))
					.run();
				recordAudit({
					projectId,
					userId,
					action: 'fixture.rc-assign',
					entity: 'fixture',
					entityId: f.id,
					before: { rcChannels: f.rcChannels },
					after: { rcChannels: channels }
				});
			}
		}
		return { assigned, unassigned, applied: o.apply };
	});
}
