import { z } from 'zod';
import '../messages';
import { FIXTURE_STATES } from '../vocab';
import { keyedRecord } from './record';

// Fixture bodies for the JSON API and the forms; client-safe. Checks that need
// the database (the universe is this project's, the mode is the type's, the
// footprint fits) run on the server in src/lib/server/db/fixtures.ts.

const id = z.int().positive();
// ANSI E1.11: slots 1–512
const address = z.int().min(1, 'Addresses are 1–512.').max(512, 'Addresses are 1–512.');
const parameterKey = z.string().min(1).max(60);

// GDTF DMX breaks 2…n of a multi-break mode, each with its own universe and start address
// (DIN SPEC 15800 DMX mode); break 1 is the control's own universeId and address.
export const breakAddressInput = z.strictObject({
	dmxBreak: z.int().min(2, "Break 1 is the fixture's own universe and address; list breaks from 2.").max(64),
	universeId: id,
	address
});

export const controlInput = z.discriminatedUnion('kind', [
	z.strictObject({
		kind: z.literal('dmx'),
		universeId: id,
		address,
		breaks: z
			.array(breakAddressInput)
			.max(63)
			.refine((bs) => new Set(bs.map((b) => b.dmxBreak)).size === bs.length, 'Each DMX break is listed once.')
			.optional()
	}),
	z.strictObject({ kind: z.literal('dmx-map'), universeId: id, addresses: keyedRecord(parameterKey, address) }),
	z.strictObject({
		kind: z.literal('rc'),
		receiverId: id,
		channels: keyedRecord(parameterKey, z.int().min(1, 'RC channels start at 1.').max(99)).default({})
	}),
	z.strictObject({ kind: z.literal('follow'), leaderId: id }),
	z.strictObject({ kind: z.literal('manual') })
]);

// What powers the fixture (issue 15): a pack type, a circuit, or nothing planned yet.
export const feedInput = z.discriminatedUnion('kind', [
	z.strictObject({ kind: z.literal('battery'), packTypeId: id }),
	z.strictObject({ kind: z.literal('mains'), circuitId: id }),
	z.strictObject({ kind: z.literal('none') })
]);

export const lookInput = z.strictObject({
	hue: z.number().min(0).max(360).nullable().optional(),
	saturation: z.number().min(0).max(100).nullable().optional(),
	intensity: z.number().min(0).max(100).nullable().optional(),
	cct: z.int().min(1000).max(20000).nullable().optional()
});

const fields = {
	number: z.int().min(1, 'Fixture numbers start at 1.').max(999999),
	label: z.string().trim().max(60),
	typeId: id,
	modeId: id,
	position: z.string().trim().max(120),
	group: z.string().trim().max(120),
	linkGroup: z.string().trim().min(1).max(60).nullable(),
	colour: z.string().trim().max(40),
	watts: z.int().min(0).max(100000).nullable(),
	notes: z.string().max(5000),
	state: z.enum(FIXTURE_STATES),
	look: lookInput,
	control: controlInput,
	feed: feedInput
};

export const fixtureCreate = z.strictObject({
	number: fields.number,
	label: fields.label.default(''),
	typeId: fields.typeId,
	modeId: fields.modeId,
	position: fields.position.default(''),
	group: fields.group.default(''),
	linkGroup: fields.linkGroup.default(null),
	colour: fields.colour.default(''),
	watts: fields.watts.default(null),
	notes: fields.notes.default(''),
	state: fields.state.default('planned'),
	look: fields.look.default({}),
	control: fields.control.default({ kind: 'manual' }),
	feed: fields.feed.default({ kind: 'none' })
});

export const fixtureCreateList = z.array(fixtureCreate).min(1, 'Send at least one fixture.').max(5000);

const patchFields = {
	number: fields.number.optional(),
	label: fields.label.optional(),
	typeId: fields.typeId.optional(),
	modeId: fields.modeId.optional(),
	position: fields.position.optional(),
	group: fields.group.optional(),
	linkGroup: fields.linkGroup.optional(),
	colour: fields.colour.optional(),
	watts: fields.watts.optional(),
	notes: fields.notes.optional(),
	state: fields.state.optional(),
	look: fields.look.optional(),
	control: fields.control.optional(),
	feed: fields.feed.optional(),
	version: z.int().positive()
};

export const fixturePatch = z.strictObject(patchFields);

export const fixtureBulkPatch = z.strictObject({
	fixtures: z
		.array(z.strictObject({ id, ...patchFields }))
		.min(1)
		.max(5000)
		.superRefine((list, ctx) => {
			const seen = new Set<number>();
			list.forEach((f, i) => {
				if (seen.has(f.id))
					ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `Fixture id ${f.id} is listed twice.` });
				seen.add(f.id);
			});
		})
});

/** What an electrician may change on set (DESIGN.md "Roles"); photos have their own route. */
export const ELECTRICIAN_FIELDS: readonly string[] = ['state', 'notes', 'version'];

export const autopatchInput = z.strictObject({
	fixtureIds: z.array(id).min(1, 'Choose at least one fixture.').max(5000),
	universeId: id,
	start: address.default(1),
	align: z.int().min(1).max(512).default(1),
	gap: z.int().min(0).max(511).default(0),
	// a multi-break mode's further breaks: each to a universe of its own; a break not listed follows on after break 1
	breakUniverses: z
		.array(z.strictObject({ dmxBreak: breakAddressInput.shape.dmxBreak, universeId: id }))
		.max(63)
		.refine((bs) => new Set(bs.map((b) => b.dmxBreak)).size === bs.length, 'Each DMX break is listed once.')
		.default([]),
	apply: z.boolean().default(false)
});

/** The table's Delete of a selection: one request, all or nothing. */
export const fixtureBulkDelete = z.strictObject({
	ids: z
		.array(id)
		.min(1, 'Choose at least one fixture.')
		.max(20000)
		.refine((l) => new Set(l).size === l.length, 'A fixture is listed twice.'),
	detach: z.boolean().default(false)
});

export type FeedInput = z.output<typeof feedInput>;
export type ControlInput = z.output<typeof controlInput>;
export type FixtureCreate = z.output<typeof fixtureCreate>;
export type FixturePatch = z.output<typeof fixturePatch>;
export type FixtureBulkPatch = z.output<typeof fixtureBulkPatch>;
export type AutopatchInput = z.output<typeof autopatchInput>;
