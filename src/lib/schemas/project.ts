import { z } from 'zod';
import '../messages';
import { ROLES } from '../vocab';

// Shared by the JSON API and the forms; client-safe (no server imports).

const isoDate = z
	.string()
	.regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2027-03-08.')
	.nullable();

const fields = {
	name: z.string().trim().min(1, 'Give the project a name.').max(120),
	venue: z.string().trim().max(200),
	startsOn: isoDate,
	endsOn: isoDate,
	notes: z.string().max(5000),
	artnetOffset: z.union([z.literal(0), z.literal(1)])
};

/** A project's last day is never before its first (checked when both are given). */
function datesInOrder(p: { startsOn?: string | null; endsOn?: string | null }, ctx: z.RefinementCtx): void {
	if (p.startsOn && p.endsOn && p.endsOn < p.startsOn)
		ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'The last day cannot be before the first day.' });
}

export const projectCreate = z
	.strictObject({
		name: fields.name,
		venue: fields.venue.default(''),
		startsOn: fields.startsOn.optional(),
		endsOn: fields.endsOn.optional(),
		notes: fields.notes.default(''),
		artnetOffset: fields.artnetOffset.default(1)
	})
	.superRefine(datesInOrder);

// An update names only what it changes: no defaults here, or an absent field would be reset.
export const projectPatch = z
	.strictObject({
		name: fields.name.optional(),
		venue: fields.venue.optional(),
		startsOn: fields.startsOn.optional(),
		endsOn: fields.endsOn.optional(),
		notes: fields.notes.optional(),
		artnetOffset: fields.artnetOffset.optional(),
		version: z.int().positive()
	})
	.superRefine(datesInOrder);

export const memberInvite = z.strictObject({
	email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
	role: z.enum(ROLES)
});

export const memberPatch = z.strictObject({
	role: z.enum(ROLES),
	version: z.int().positive().optional()
});
