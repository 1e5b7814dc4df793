import { z } from 'zod';
import '../messages';
import { FIXTURE_STATES } from '../vocab';
import { feedInput } from './fixture';

// The patch table's bulk tools (POST /api/projects/:pid/fixtures/bulk), one action a request,
// each one transaction; client-safe so the page validates with the same rules.

const id = z.int().positive();
const number = z.int().min(1, 'Fixture numbers start at 1.').max(999999, 'Fixture numbers go up to 999999.');
const ids = z
	.array(id)
	.min(1, 'Choose at least one fixture.')
	.max(5000, 'At most 5000 fixtures at a time.')
	.refine((l) => new Set(l).size === l.length, 'A fixture is listed twice.');
// `{n}` fixture number, `{i}` 1…N, `{n:03}` padded
const pattern = z.string().trim().max(60, 'Labels are at most 60 characters.');

export const bulkAdd = z.strictObject({
	action: z.literal('add'),
	count: z.int().min(1, 'Add at least 1 fixture.').max(500, 'Add at most 500 fixtures at a time.'),
	firstNumber: number,
	typeId: id,
	modeId: id,
	labelPattern: pattern.default(''),
	/** both or neither: with them the run is laid end to end from `address` */
	universeId: id.nullable().default(null),
	address: z.int().min(1, 'Addresses are 1–512.').max(512, 'Addresses are 1–512.').nullable().default(null)
});

export const bulkRenumber = z.strictObject({
	action: z.literal('renumber'),
	ids,
	from: number,
	step: z.int().min(1, 'The step is at least 1.').max(1000, 'The step is at most 1000.').default(1)
});

export const bulkRelabel = z.strictObject({
	action: z.literal('relabel'),
	ids,
	pattern: pattern.refine((p) => p !== '', 'Write a label pattern, like DECK {n}.')
});

export const bulkDuplicate = z.strictObject({
	action: z.literal('duplicate'),
	ids,
	firstNumber: number.nullable().default(null)
});

export const bulkSetFields = z
	.strictObject({
		modeId: id.optional(),
		state: z.enum(FIXTURE_STATES).optional(),
		feed: feedInput.optional(),
		position: z.string().trim().max(120).optional(),
		group: z.string().trim().max(120).optional(),
		colour: z.string().trim().max(40).optional(),
		watts: z.int().min(0).max(100000).nullable().optional()
	})
	.refine((f) => Object.values(f).some((v) => v !== undefined), 'Choose at least one field to set.');

export const bulkSet = z.strictObject({ action: z.literal('set'), ids, fields: bulkSetFields });

export const bulkAction = z.discriminatedUnion('action', [bulkAdd, bulkRenumber, bulkRelabel, bulkDuplicate, bulkSet]);

export type BulkAction = z.output<typeof bulkAction>;
export type BulkAdd = z.output<typeof bulkAdd>;
export type BulkSetFields = z.output<typeof bulkSetFields>;
