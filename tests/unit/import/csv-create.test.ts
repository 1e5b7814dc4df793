import { describe, expect, it } from 'vitest';
import { plainCreate, type CreateValues } from '../../../src/lib/server/import/csv';
import { fixtureCreate } from '../../../src/lib/schemas/fixture';

// A CSV import builds each new fixture's create body directly when its values are plainly inside the
// schema's bounds (plainCreate), and asks the schema otherwise: the two must answer the same body, and
// plainCreate must never pass what the schema refuses.

const base: CreateValues = { number: 7, typeId: 3, modeId: 4 };
const dmx = (universeId: number, address: number) => ({ kind: 'dmx' as const, universeId, address });

const plain: [string, CreateValues][] = [
	['only the required values', base],
	['manual control, every text', { ...base, label: 'Key 1', position: 'Dock', group: 'Front', notes: 'gel L201' }],
	['a DMX patch', { ...base, control: dmx(2, 101) }],
	['a DMX patch at both ends of the universe', { ...base, control: dmx(1, 512), number: 999999 }],
	[
		'further DMX breaks',
		{
			...base,
			control: {
				...dmx(1, 1),
				breaks: [
					{ dmxBreak: 2, universeId: 5, address: 10 },
					{ dmxBreak: 64, universeId: 6, address: 512 }
				]
			}
		}
	],
	['a battery feed', { ...base, feed: { kind: 'battery', packTypeId: 9 } }],
	['a mains feed', { ...base, feed: { kind: 'mains', circuitId: 2 } }],
	['no feed', { ...base, feed: { kind: 'none' } }],
	['texts at their longest', { ...base, label: 'l'.repeat(60), position: 'p'.repeat(120), notes: 'n'.repeat(5000) }]
];

const refused: [string, CreateValues][] = [
	['number 0', { ...base, number: 0 }],
	['number past 999999', { ...base, number: 1000000 }],
	['address 0', { ...base, control: dmx(1, 0) }],
	['address 513', { ...base, control: dmx(1, 513) }],
	['a label of 61 characters', { ...base, label: 'l'.repeat(61) }],
	['a group of 121 characters', { ...base, group: 'g'.repeat(121) }],
	['notes past 5000 characters', { ...base, notes: 'n'.repeat(5001) }],
	[
		'break 1 listed as a further break',
		{ ...base, control: { ...dmx(1, 1), breaks: [{ dmxBreak: 1, universeId: 1, address: 9 }] } }
	],
	[
		'a break listed twice',
		{
			...base,
			control: {
				...dmx(1, 1),
				breaks: [
					{ dmxBreak: 2, universeId: 1, address: 9 },
					{ dmxBreak: 2, universeId: 1, address: 20 }
				]
			}
		}
	],
	[
		'a break past slot 512',
		{ ...base, control: { ...dmx(1, 1), breaks: [{ dmxBreak: 2, universeId: 1, address: 600 }] } }
	]
];

describe('plainCreate (CSV import rows without the schema pass)', () => {
	it.each(plain)('%s: the same body as fixtureCreate.parse', (_, values) => {
		const direct = plainCreate(values);
		expect(direct).not.toBeNull();
		expect(direct).toStrictEqual(fixtureCreate.parse(values));
	});

	it.each(refused)('%s: left to the schema, which refuses it', (_, values) => {
		expect(plainCreate(values)).toBeNull();
		expect(fixtureCreate.safeParse(values).success).toBe(false);
	});
});
