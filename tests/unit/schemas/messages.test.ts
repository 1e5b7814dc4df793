import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import { fieldErrors } from '../../../src/lib/forms';
import { fieldWord } from '../../../src/lib/messages';
import { universeCreate } from '../../../src/lib/schemas/universe';
import { projectCreate } from '../../../src/lib/schemas/project';
import { typeCreate } from '../../../src/lib/schemas/type';

// Issue 16: validation speaks to a crew member, never in zod's own words.
function messages(schema: z.ZodType, input: unknown): Record<string, string> {
	const parsed = schema.safeParse(input);
	if (parsed.success) throw new Error('expected a refusal');
	return fieldErrors(parsed.error.issues.map((i) => ({ path: i.path as (string | number)[], message: i.message })));
}

describe('human validation messages', () => {
	it('names the field and the limit for a long text', () => {
		expect(messages(universeCreate, { number: 1, name: 'x'.repeat(121) })).toEqual({
			name: 'Name is too long — 120 characters at most.'
		});
		const label = z.object({ label: z.string().max(120) });
		expect(messages(label, { label: 'y'.repeat(200) }).label).toBe('Label is too long — 120 characters at most.');
	});

	it('asks to pick a universe rather than reporting a null number', () => {
		const control = z.object({ control: z.object({ universeId: z.int() }) });
		expect(messages(control, { control: { universeId: null } })['control.universeId']).toBe('Pick a universe.');
	});

	it('says a missing number is required and a typed word is not a whole number', () => {
		expect(messages(universeCreate, {}).number).toBe('Number is required.');
		expect(messages(universeCreate, { number: Number('abc') }).number).toBe('Number must be a whole number.');
	});

	it('keeps the messages written beside a rule', () => {
		expect(messages(universeCreate, { number: 0 }).number).toBe('Universe numbers start at 1.');
		expect(messages(typeCreate, { maker: '', model: 'm', modes: [] }).maker).toBe('Name the maker.');
	});

	it('asks to pick from a list for an unknown choice', () => {
		expect(messages(universeCreate, { number: 1, transport: 'pigeon' }).transport).toBe('Pick a transport.');
		expect(messages(projectCreate, { name: 'p', artnetOffset: 7 }).artnetOffset).toBe('Pick an Art-Net numbering.');
	});

	it('never leaks zod wording', () => {
		const all = [
			...Object.values(messages(universeCreate, { number: null, name: 5, transport: 1, extra: true })),
			...Object.values(messages(projectCreate, { name: 'x'.repeat(500), notes: 3 }))
		];
		for (const m of all) expect(m).not.toMatch(/expected|received|Invalid input|Too big|<=/);
	});

	it('words camelCase keys', () => {
		expect(fieldWord(['transmitterNotes'])).toBe('transmitter notes');
		expect(fieldWord(['modes', 0, 'channels', 2, 'parameter'])).toBe('parameter');
		expect(fieldWord([])).toBe('this value');
	});
});

describe('field names that are also Object.prototype members', () => {
	it('a field called constructor is worded as itself, not read from the prototype (fuzz found a 500 here)', () => {
		expect(fieldWord(['labels', 'constructor'])).toBe('constructor');
		expect(fieldWord(['toString'])).toBe('to string');
	});
});
