import { z } from 'zod';
import '../messages';

// Universe bodies for the JSON API and the forms; client-safe.

export const TRANSPORT_VALUES = ['dmx-wired', 'dmx-wireless', 'sacn', 'artnet'] as const;

const fields = {
	// ANSI E1.31: sACN universes run 1–63999; we use the same range on paper for every transport
	number: z.int().min(1, 'Universe numbers start at 1.').max(63999, 'Universe numbers stop at 63999.'),
	name: z.string().trim().max(120),
	transport: z.enum(TRANSPORT_VALUES),
	notes: z.string().max(5000)
};

export const universeCreate = z.strictObject({
	number: fields.number,
	name: fields.name.default(''),
	transport: fields.transport.default('dmx-wired'),
	notes: fields.notes.default('')
});

export const universePatch = z.strictObject({
	number: fields.number.optional(),
	name: fields.name.optional(),
	transport: fields.transport.optional(),
	notes: fields.notes.optional(),
	version: z.int().positive()
});

export type UniverseCreate = z.output<typeof universeCreate>;
export type UniversePatch = z.output<typeof universePatch>;
