import { z } from 'zod';
import '../messages';

// Shared by the JSON API and the forms; client-safe (no server imports).

export const DECISION_VALUES = ['approved', 'changes-requested'] as const;

export const revisionCreate = z.strictObject({
	note: z.string().trim().max(2000, 'Keep the note under 2000 characters.').default('')
});

export const reviewLinkCreate = z.strictObject({
	revision: z.union([z.int().positive(), z.literal('latest')]).default('latest'),
	// null: the link never expires (it can still be revoked)
	expiresInDays: z.int().min(1, 'At least one day.').max(365, 'At most a year.').nullable().default(30),
	email: z.string().trim().toLowerCase().email('Enter an e-mail address.').max(254).optional()
});

const comment = z.string().trim().max(2000, 'Keep the comment under 2000 characters.').default('');
const decision = z.enum(DECISION_VALUES, { error: 'Choose approved or changes requested.' });

export const memberSignoff = z.strictObject({ decision, comment });

export const linkSignoff = z.strictObject({
	name: z.string().trim().min(1, 'Tell us your name.').max(120),
	decision,
	comment
});
