import { z } from 'zod';
import '../messages';

// Shared by the JSON API and the forms; client-safe (no server imports).

const isoDate = z
	.string()
	.regex(/^\d{4}-\d{2}-\d{2}$/, 'Use a date like 2027-03-08.')
	.nullable();

const projectFields = z.strictObject({
	name: z.string().trim().min(1, 'Give the project a name.').max(120),
	venue: z.string().trim().max(200).default(''),
	startsOn: isoDate.optional(),
	endsOn: isoDate.optional(),
	notes: z.string().max(5000).default(''),
	artnetOffset: z.union([z.literal(0), z.literal(1)]).default(1)
});

/** A project's last day is never before its first (checked when both are given). */
function datesInOrder(p: { startsOn?: string | null; endsOn?: string | null }, ctx: z.RefinementCtx): void {
	if (p.startsOn && p.endsOn && p.endsOn < p.startsOn)
		ctx.addIssue({ code: 'custom', path: ['endsOn'], message: 'The last day cannot be before the first day.' });
}

export const projectCreate = projectFields.superRefine(datesInOrder);

export const projectPatch = projectFields.partial().extend({ version: z.int().positive() }).superRefine(datesInOrder);

export const ROLE_VALUES = ['owner', 'programmer', 'electrician', 'viewer'] as const;

export const memberInvite = z.strictObject({
	email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
	role: z.enum(ROLE_VALUES)
});

export const memberPatch = z.strictObject({
	role: z.enum(ROLE_VALUES),
	version: z.int().positive().optional()
});

export const signUp = z.strictObject({
	name: z.string().trim().min(1, 'Tell us your name.').max(120),
	email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254),
	password: z.string().min(10, 'Use at least 10 characters.').max(200)
});
