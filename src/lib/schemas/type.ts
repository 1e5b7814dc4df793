import { z } from 'zod';
import '../messages';

// Fixture types with their modes inline; client-safe. The footprint rules
// (DESIGN.md "Mode") are checked here so a form can show them before sending.

export const SLOTS_PER_UNIVERSE = 512;

export const channelInput = z.strictObject({
	// null: a virtual channel that takes no slot
	offset: z.int().min(1, 'Channel offsets start at 1.').max(SLOTS_PER_UNIVERSE).nullable(),
	parameter: z.string().trim().min(1, 'Name the parameter.').max(60),
	bits: z.union([z.literal(8), z.literal(16), z.literal(24), z.literal(32)], {
		message: 'Bits are 8, 16, 24 or 32.'
	}),
	default: z.int().min(0).default(0),
	// min is the physical value at the start of the DMX range, max at its end; min > max runs downward
	min: z.number().finite().optional(),
	max: z.number().finite().optional(),
	unit: z.string().trim().max(20).optional(),
	// DMX sub-range the physical range covers, at the channel's resolution (GDTF ChannelFunction DMXFrom)
	dmxFrom: z.int().min(0).optional(),
	dmxTo: z.int().min(0).optional(),
	// GDTF DMXChannel DMXBreak: which of the fixture's start addresses the offset counts from
	dmxBreak: z.int().min(1, 'DMX breaks start at 1.').max(64).optional(),
	// slots of the finer bytes when they do not follow the coarse byte (GDTF Offset "2,9")
	fineOffsets: z.array(z.int().min(1).max(SLOTS_PER_UNIVERSE)).max(3).optional()
});

function slotsOf(ch: ChannelInput): number[] {
	if (ch.offset === null) return [];
	if (ch.fineOffsets && ch.fineOffsets.length > 0) return [ch.offset, ...ch.fineOffsets];
	const out: number[] = [];
	for (let i = 0; i < ch.bits / 8; i++) out.push(ch.offset + i);
	return out;
}

export type ChannelInput = z.output<typeof channelInput>;

export const modeInput = z
	.strictObject({
		id: z.int().positive().optional(),
		name: z.string().trim().min(1, 'Name the mode.').max(80),
		channels: z.array(channelInput).max(512),
		// power (issue 15): draw at full output and the accepted input voltage
		watts: z.number().finite().min(0).max(100000).nullable().optional(),
		inputVolts: z
			.strictObject({ min: z.number().finite().min(0).max(1000), max: z.number().finite().min(0).max(1000) })
			.refine((v) => v.min <= v.max, { message: 'The lowest input voltage is above the highest.', path: ['min'] })
			.nullable()
			.optional()
	})
	.superRefine((mode, ctx) => {
		// one slot map per DMX break: break 2's slot 1 is not break 1's slot 1
		const owners = new Map<number, Map<number, string>>();
		const names = new Set<string>();
		mode.channels.forEach((ch, i) => {
			if (names.has(ch.parameter)) {
				ctx.addIssue({
					code: 'custom',
					path: ['channels', i, 'parameter'],
					message: `"${ch.parameter}" appears twice in this mode.`
				});
			}
			names.add(ch.parameter);
			if (ch.default > 2 ** ch.bits - 1) {
				ctx.addIssue({
					code: 'custom',
					path: ['channels', i, 'default'],
					message: `A ${ch.bits}-bit default is 0–${2 ** ch.bits - 1}.`
				});
			}
			if (ch.dmxFrom !== undefined && ch.dmxTo !== undefined && ch.dmxFrom > ch.dmxTo) {
				ctx.addIssue({
					code: 'custom',
					path: ['channels', i, 'dmxFrom'],
					message: 'The DMX range starts above its end.'
				});
			}
			if (ch.dmxTo !== undefined && ch.dmxTo > 2 ** ch.bits - 1) {
				ctx.addIssue({
					code: 'custom',
					path: ['channels', i, 'dmxTo'],
					message: `A ${ch.bits}-bit DMX range ends at ${2 ** ch.bits - 1} at most.`
				});
			}
			if (ch.fineOffsets !== undefined && ch.fineOffsets.length > 0 && ch.fineOffsets.length !== ch.bits / 8 - 1) {
				ctx.addIssue({
					code: 'custom',
					path: ['channels', i, 'fineOffsets'],
					message: `A ${ch.bits}-bit channel has ${ch.bits / 8 - 1} finer bytes.`
				});
				return;
			}
			if (ch.offset === null) return;
			const brk = ch.dmxBreak ?? 1;
			let owner = owners.get(brk);
			if (owner === undefined) owners.set(brk, (owner = new Map()));
			for (const s of slotsOf(ch)) {
				if (s > SLOTS_PER_UNIVERSE) {
					ctx.addIssue({
						code: 'custom',
						path: ['channels', i, 'offset'],
						message: `${ch.parameter} would end on slot ${s}; a mode fits in 512 slots.`
					});
					return;
				}
				const other = owner.get(s);
				if (other !== undefined) {
					ctx.addIssue({
						code: 'custom',
						path: ['channels', i, 'offset'],
						message: `${ch.parameter} and ${other} both claim slot ${s}${brk === 1 ? '' : ` of DMX break ${brk}`}.`
					});
					return;
				}
				owner.set(s, ch.parameter);
			}
		});
	});

const modesList = z
	.array(modeInput)
	.min(1, 'A type needs at least one mode.')
	.max(64)
	.superRefine((list, ctx) => {
		const ids = new Set<number>();
		list.forEach((m, i) => {
			if (m.id === undefined) return;
			if (ids.has(m.id)) ctx.addIssue({ code: 'custom', path: [i, 'id'], message: `Mode id ${m.id} is listed twice.` });
			ids.add(m.id);
		});
	});

export const typeCreate = z.strictObject({
	maker: z.string().trim().min(1, 'Name the maker.').max(120),
	model: z.string().trim().min(1, 'Name the model.').max(120),
	notes: z.string().max(5000).default(''),
	// share of full draw at zero intensity (electronics, fan); common practice about 0.1
	drawFloor: z.number().finite().min(0).max(1).default(0.1),
	modes: modesList
});

export const typePatch = z.strictObject({
	maker: z.string().trim().min(1).max(120).optional(),
	model: z.string().trim().min(1).max(120).optional(),
	notes: z.string().max(5000).optional(),
	drawFloor: z.number().finite().min(0).max(1).optional(),
	modes: modesList.optional(),
	version: z.int().positive()
});

export type ModeInput = z.output<typeof modeInput>;
export type TypeCreate = z.output<typeof typeCreate>;
export type TypePatch = z.output<typeof typePatch>;

/**
 * Moving the fixtures that use a mode (or a type) to another mode before it is deleted: the
 * fixtures are the ones the page showed, each with the version read, so a fixture changed or
 * added meanwhile refuses the delete instead of being moved unseen.
 */
export const fixtureMove = z.strictObject({
	toModeId: z.int({ message: 'Pick the mode to move them to.' }).positive('Pick the mode to move them to.'),
	fixtures: z
		.array(z.strictObject({ id: z.int().positive(), version: z.int().positive() }))
		.min(1)
		.max(5000)
});
export type FixtureMove = z.output<typeof fixtureMove>;
