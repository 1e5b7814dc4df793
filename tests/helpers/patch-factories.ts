import { and, eq } from 'drizzle-orm';
import type { Db } from '../../src/lib/server/db/index';
import { fixtureTypes, fixtures, modeChannels, modes, receivers, universes } from '../../src/lib/server/db/schema';

// Rig data written straight into the server's database file, for tests that
// need a patch in place before they drive the API.

export interface ChannelSpec {
	offset: number | null;
	parameter: string;
	bits?: 8 | 16 | 24;
	/** the DMX break the offset counts from (DIN SPEC 15800 multi-break modes); 1 when left out */
	dmxBreak?: number;
}

export function makeUniverse(db: Db, projectId: number, number: number, transport: 'dmx-wired' | 'sacn' = 'dmx-wired') {
	return db
		.insert(universes)
		.values({ projectId, number, name: `U${number}`, transport })
		.returning()
		.get();
}

/** A type with named modes; returns the type row and its modes' ids by name. */
export function makeType(db: Db, projectId: number, modeSpecs: Record<string, ChannelSpec[]>, model = 'Test Panel') {
	// maker + model is unique per project (migration 0004): a second default type becomes "Test Panel 2"
	const taken = new Set(
		db
			.select({ model: fixtureTypes.model })
			.from(fixtureTypes)
			.where(and(eq(fixtureTypes.projectId, projectId), eq(fixtureTypes.maker, 'Testworks')))
			.all()
			.map((t) => t.model.toLowerCase())
	);
	let free = model;
	for (let n = 2; taken.has(free.toLowerCase()); n++) free = `${model} ${n}`;
	const type = db.insert(fixtureTypes).values({ projectId, maker: 'Testworks', model: free }).returning().get();
	const modeIds: Record<string, number> = {};
	Object.entries(modeSpecs).forEach(([name, channels], position) => {
		const mode = db.insert(modes).values({ typeId: type.id, name, position }).returning().get();
		modeIds[name] = mode.id;
		if (channels.length) {
			db.insert(modeChannels)
				.values(
					channels.map((c, i) => ({
						modeId: mode.id,
						position: i,
						offset: c.offset,
						parameter: c.parameter,
						bits: c.bits ?? 8,
						dmxBreak: c.dmxBreak ?? 1
					}))
				)
				.run();
		}
	});
	return { type, modeIds };
}

/** Contiguous 8-bit channels named p1…pn. */
export function channels(n: number, bits: 8 | 16 = 8): ChannelSpec[] {
	return Array.from({ length: n }, (_, i) => ({ offset: 1 + i * (bits / 8), parameter: `p${i + 1}`, bits }));
}

export function makeReceiver(
	db: Db,
	projectId: number,
	protocol: 'sbus' | 'crsf' | 'ppm' = 'sbus',
	name = 'Test receiver'
) {
	return db.insert(receivers).values({ projectId, name, protocol }).returning().get();
}

export function makeFixture(db: Db, values: typeof fixtures.$inferInsert) {
	return db.insert(fixtures).values(values).returning().get();
}
