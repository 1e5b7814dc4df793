import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { assignRc, defaultChannelCount, type RcFixtureInput } from '../../../src/lib/patch';

const rcFixture = (id: number, parameters: string[], over: Partial<RcFixtureInput> = {}): RcFixtureInput => ({
	id,
	number: id,
	linkGroup: null,
	parameters,
	...over
});

// Channel counts: SBUS 16 proportional + 2 digital, CRSF 16, PPM 8 (common practice of the
// open RC firmware projects, from memory).
describe('assignRc', () => {
	it('knows the protocols’ channel counts', () => {
		expect([defaultChannelCount('sbus'), defaultChannelCount('crsf'), defaultChannelCount('ppm')]).toEqual([18, 16, 8]);
	});

	it('gives each fixture a block of adjacent channels, in fixture-number order', () => {
		const r = assignRc({
			receiver: { id: 1, protocol: 'crsf' },
			fixtures: [rcFixture(2, ['intensity', 'cct']), rcFixture(1, ['intensity', 'hue', 'saturation'])]
		});
		expect(r).toEqual({
			assigned: [
				{ fixtureId: 1, parameter: 'intensity', channel: 1 },
				{ fixtureId: 1, parameter: 'hue', channel: 2 },
				{ fixtureId: 1, parameter: 'saturation', channel: 3 },
				{ fixtureId: 2, parameter: 'intensity', channel: 4 },
				{ fixtureId: 2, parameter: 'cct', channel: 5 }
			],
			unassigned: []
		});
	});

	it('gives a link group one set of channels that every member shares', () => {
		const r = assignRc({
			receiver: { id: 1, protocol: 'ppm' },
			fixtures: [
				rcFixture(1, ['intensity', 'cct'], { linkGroup: 'car' }),
				rcFixture(2, ['intensity']),
				rcFixture(3, ['intensity', 'cct'], { linkGroup: 'car' })
			]
		});
		expect(r.assigned).toEqual([
			{ fixtureId: 1, parameter: 'intensity', channel: 1 },
			{ fixtureId: 1, parameter: 'cct', channel: 2 },
			{ fixtureId: 2, parameter: 'intensity', channel: 3 },
			{ fixtureId: 3, parameter: 'intensity', channel: 1 },
			{ fixtureId: 3, parameter: 'cct', channel: 2 }
		]);
	});

	it('keeps SBUS digital channels 17–18 for switch-like parameters only', () => {
		const r = assignRc({
			receiver: { id: 1, protocol: 'sbus' },
			fixtures: [rcFixture(1, ['intensity', 'power switch', 'blackout'], { digital: ['blackout'] })]
		});
		expect(r.assigned).toEqual([
			{ fixtureId: 1, parameter: 'intensity', channel: 1 },
			{ fixtureId: 1, parameter: 'power switch', channel: 17 },
			{ fixtureId: 1, parameter: 'blackout', channel: 18 }
		]);
		const fill = Array.from({ length: 16 }, (_, i) => rcFixture(i + 1, ['intensity']));
		const full = assignRc({
			receiver: { id: 1, protocol: 'sbus', name: 'Boat' },
			fixtures: [...fill, rcFixture(17, ['hue'])]
		});
		expect(full.assigned.every((a) => a.channel <= 16)).toBe(true);
		expect(full.unassigned).toEqual([
			{
				fixtureId: 17,
				parameter: 'hue',
				reason: 'fixture 17 needs 1 adjacent free channel; receiver "Boat" has 0 free of channels 1–16 — it is full'
			}
		]);
	});

	it('says when no adjacent block is left, and never drops a parameter silently', () => {
		const r = assignRc({
			receiver: { id: 1, protocol: 'ppm' },
			fixtures: [
				rcFixture(1, ['a', 'b', 'c']),
				rcFixture(2, ['a', 'b', 'c']),
				rcFixture(3, ['a', 'b', 'c']),
				rcFixture(4, ['a'])
			]
		});
		expect(r.assigned.map((a) => `${a.fixtureId}${a.parameter}${a.channel}`)).toEqual([
			'1a1',
			'1b2',
			'1c3',
			'2a4',
			'2b5',
			'2c6',
			'4a7'
		]);
		expect(r.unassigned).toEqual(
			['a', 'b', 'c'].map((p) => ({
				fixtureId: 3,
				parameter: p,
				reason: 'fixture 3 needs 3 adjacent free channels; receiver 1 has 2 free of channels 1–8 (largest block 2)'
			}))
		);
	});

	it('keeps valid existing channels when asked, and reassigns everything otherwise', () => {
		const fixtures = [
			rcFixture(1, ['intensity', 'hue'], { channels: { intensity: 5 } }),
			rcFixture(2, ['intensity'], { channels: { intensity: 1 } })
		];
		const kept = assignRc({ receiver: { id: 1, protocol: 'ppm' }, fixtures, keepExisting: true });
		expect(kept.assigned).toEqual([
			{ fixtureId: 1, parameter: 'intensity', channel: 5 },
			{ fixtureId: 1, parameter: 'hue', channel: 2 },
			{ fixtureId: 2, parameter: 'intensity', channel: 1 }
		]);
		const fresh = assignRc({ receiver: { id: 1, protocol: 'ppm' }, fixtures });
		expect(fresh.assigned.map((a) => a.channel)).toEqual([1, 2, 3]);
	});

	it('property: never gives one channel to two units, stays in range, and accounts for every parameter', () => {
		const arb = fc.record({
			protocol: fc.constantFrom('sbus' as const, 'crsf' as const, 'ppm' as const),
			count: fc.option(fc.integer({ min: 1, max: 18 })),
			fixtures: fc.array(
				fc.record({
					params: fc.subarray(['intensity', 'hue', 'cct', 'switch', 'fan']),
					group: fc.constantFrom<string | null>(null, null, 'A', 'B'),
					existing: fc.integer({ min: 0, max: 20 })
				}),
				{ maxLength: 12 }
			),
			keep: fc.boolean()
		});
		fc.assert(
			fc.property(arb, ({ protocol, count, fixtures, keep }) => {
				const input = fixtures.map((f, i) =>
					rcFixture(i + 1, f.params, {
						linkGroup: f.group,
						channels: f.params.length > 0 ? { [f.params[0] as string]: f.existing } : {}
					})
				);
				const receiver = { id: 1, protocol, ...(count === null ? {} : { channelCount: count }) };
				const r = assignRc({ receiver, fixtures: input, keepExisting: keep });
				const max = count ?? defaultChannelCount(protocol);
				expect(r.assigned.length + r.unassigned.length).toBe(input.reduce((n, f) => n + f.parameters.length, 0));
				const owner = new Map<number, string>();
				for (const a of r.assigned) {
					expect(a.channel).toBeGreaterThanOrEqual(1);
					expect(a.channel).toBeLessThanOrEqual(max);
					const f = input.find((x) => x.id === a.fixtureId) as RcFixtureInput;
					const unit = `${f.linkGroup ?? `#${f.id}`}|${a.parameter}`;
					expect(owner.get(a.channel) ?? unit).toBe(unit);
					owner.set(a.channel, unit);
				}
			}),
			{ numRuns: 300 }
		);
	});
});
