import { z } from 'zod';
import '../messages';

// Fixture types with their modes inline; client-safe. The footprint rules
// (DESIGN.md "Mode") are checked here so a form can show them before sending.

export const SLOTS_PER_UNIVERSE = 512;

export const channelInput = z.strictObject({
	// null: a virtual channel that takes no slot
	offset: z.int().min(1, 'Channel offsets start at 1.').max(SLOTS_PER_UNIVERSE).nullable(),
	parameter: z.string().trim().min(1, 'Name the parameter.').max(60),
	bits: z.union([z.literal(8), z.literal(16), z.literal(24)], { message: 'Bits are 8, 16 or 24.' }),
	default: z.int().min(0).default(0),
	min: z.number().finite().optional(),
	max: z.number().finite().optional(),
	unit: z.string().trim().max(20).optional()
});

function slotsOf(offset: number, bits: number): number[] {
	const out: number[] = [];
	for (let i = 0; i < bits / 8; i++) out.push(offset + i);
	return out;
}

export const modeInput = z
	.strictObject({
		id: z.int().positive().optional(),
		name: z.string().trim().min(1, 'Name the mode.').max(80),
		channels: z.array(channelInput).max(512)
	})
	.superRefine((mode, ctx) => {
		const owner = new Map<number, string>();
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
			if (ch.min !== undefined && ch.max !== undefined && ch.min > ch.max) {
				ctx.addIssue({ code: 'custom', path: ['channels', i, 'min'], message: 'min is above max.' });
			}
			if (ch.offset === null) return;
			for (const s of slotsOf(ch.offset, ch.bits)) {
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
						message: `${ch.parameter} and ${other} both claim slot ${s}.`
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
	modes: modesList
});

export const typePatch = z.strictObject({
	maker: z.string().trim().min(1).max(120).optional(),
	model: z.string().trim().min(1).max(120).optional(),
	notes: z.string().max(5000).optional(),
	modes: modesList.optional(),
	version: z.int().positive()
});

export type ChannelInput = z.output<typeof channelInput>;
export type ModeInput = z.output<typeof modeInput>;
export type TypeCreate = z.output<typeof typeCreate>;
export type TypePatch = z.output<typeof typePatch>;
