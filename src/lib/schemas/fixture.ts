import { z } from 'zod';
import '../messages';

// Fixture bodies for the JSON API and the forms; client-safe. Checks that need
// the database (the universe is this project's, the mode is the type's, the
// footprint fits) run on the server in src/lib/server/db/fixtures.ts.

export const FIXTURE_STATE_VALUES = ['planned', 'hung', 'addressed', 'checked', 'fault'] as const;

const id = z.int().positive();
// ANSI E1.11: slots 1–512
const address = z.int().min(1, 'Addresses are 1–512.').max(512, 'Addresses are 1–512.');
const parameterKey = z.string().min(1).max(60);

export const controlInput = z.discriminatedUnion('kind', [
	z.strictObject({ kind: z.literal('dmx'), universeId: id, address }),
	z.strictObject({ kind: z.literal('dmx-map'), universeId: id, addresses: z.record(parameterKey, address) }),
	z.strictObject({
		kind: z.literal('rc'),
		receiverId: id,
		channels: z.record(parameterKey, z.int().min(1, 'RC channels start at 1.').max(99)).default({})
	}),
	z.strictObject({ kind: z.literal('follow'), leaderId: id }),
	z.strictObject({ kind: z.literal('manual') })
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
	state: z.enum(FIXTURE_STATE_VALUES),
	look: lookInput,
	control: controlInput
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
	control: fields.control.default({ kind: 'manual' })
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
	apply: z.boolean().default(false)
});

export type ControlInput = z.output<typeof controlInput>;
export type FixtureCreate = z.output<typeof fixtureCreate>;
export type FixturePatch = z.output<typeof fixturePatch>;
export type FixtureBulkPatch = z.output<typeof fixtureBulkPatch>;
export type AutopatchInput = z.output<typeof autopatchInput>;
