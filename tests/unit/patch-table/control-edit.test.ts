import { describe, expect, it } from 'vitest';
import type { FixtureControl } from '../../../src/lib/patch';
import type { PatchData } from '../../../src/lib/shapes';
import {
	buildControl,
	followProblem,
	formFor,
	linkProblem,
	nextFreeAddress,
	rcClashes,
	suggestMap,
	suggestRc
} from '../../../src/routes/projects/[id=int]/patch/control-edit';
import { quickFixesFor } from '../../../src/routes/projects/[id=int]/patch/quick-fix';
import { followersUnderLeaders } from '../../../src/routes/projects/[id=int]/patch/rows';

// The control drawer's, link tools' and quick fixes' rules without a browser. Slot arithmetic:
// ANSI E1.11 (512 slots, a 16-bit parameter takes coarse + fine, two adjacent slots); first fit
// from the fixture's own address is common practice.

type Fx = PatchData['fixtures'][number];
const PANEL = {
	id: 10,
	name: 'HSI 8-bit',
	slots: 4,
	channels: [
		{ offset: 1, parameter: 'intensity', bits: 8 as const, default: 0 },
		{ offset: 2, parameter: 'hue', bits: 8 as const, default: 0 },
		{ offset: 3, parameter: 'saturation', bits: 8 as const, default: 0 },
		{ offset: 4, parameter: 'strobe', bits: 8 as const, default: 0 }
	]
};
const BALL = {
	id: 11,
	name: 'Dimmer 16-bit',
	slots: 2,
	channels: [{ offset: 1, parameter: 'intensity', bits: 16 as const, default: 0 }]
};

function slotsOf(c: FixtureControl, slots: number) {
	if (c.kind === 'dmx') return [{ start: c.address, end: Math.min(512, c.address + slots - 1) }];
	if (c.kind === 'dmx-map') return Object.values(c.addresses).map((a) => ({ start: a, end: a }));
	return [];
}
let nextId = 1;
function fx(number: number, control: FixtureControl, extra: Partial<Fx> = {}): Fx {
	const modeId = extra.modeId ?? 10;
	return {
		id: nextId++,
		number,
		label: `F${number}`,
		typeId: modeId === 10 ? 1 : 2,
		modeId,
		position: '',
		group: '',
		linkGroup: null,
		colour: '',
		watts: null,
		notes: '',
		state: 'planned',
		version: 1,
		look: { hue: null, saturation: null, intensity: null, cct: null },
		control,
		slots: slotsOf(control, modeId === 10 ? 4 : 2),
		footprint: modeId === 10 ? 4 : 2,
		...extra
	};
}
function patchOf(fixtures: Fx[]): PatchData {
	return {
		project: {} as PatchData['project'],
		universes: [
			{ id: 1, number: 1 },
			{ id: 2, number: 4 }
		] as PatchData['universes'],
		types: [
			{ id: 1, maker: 'M', model: 'Panel', notes: '', version: 1, modes: [PANEL] },
			{ id: 2, maker: 'M', model: 'Ball', notes: '', version: 1, modes: [BALL] }
		],
		receivers: [
			{ id: 7, name: 'Rig', protocol: 'sbus', channelCount: 18, transmitterNotes: '', labels: {}, version: 1 }
		],
		fixtures,
		conflicts: []
	};
}
const dmx = (universeId: number, address: number): FixtureControl => ({ kind: 'dmx', universeId, address });

describe('buildControl', () => {
	const a = fx(101, dmx(1, 1));
	const p = patchOf([a]);

	it('reads 2.101 as universe and address, and a bare address with the chosen universe', () => {
		const form = formFor(p, a);
		form.address = '4.101';
		expect(buildControl(p, a, form)).toEqual({ ok: true, control: { kind: 'dmx', universeId: 2, address: 101 } });
		form.address = '33';
		form.universe = '1';
		expect(buildControl(p, a, form)).toEqual({ ok: true, control: { kind: 'dmx', universeId: 1, address: 33 } });
	});

	it('refuses a footprint past slot 512 and names the last start that fits (4 slots: 509)', () => {
		const form = formFor(p, a);
		form.address = '511';
		const r = buildControl(p, a, form);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors.address).toContain('The last start that fits is 509.');
	});

	it('refuses an unknown universe in plain words', () => {
		const form = formFor(p, a);
		form.address = '9.1';
		const r = buildControl(p, a, form);
		expect(!r.ok && r.errors.universe).toBe('There is no universe 9 in this project; add it under Universes first.');
	});

	it('a per-parameter map refuses two parameters on one slot', () => {
		const form = formFor(p, a);
		form.kind = 'dmx-map';
		form.universe = '1';
		form.map = { intensity: '20', hue: '20', saturation: '22', strobe: '23' };
		const r = buildControl(p, a, form);
		expect(!r.ok && r.errors['map-hue']).toBe('Slot 20 is already given to intensity.');
	});

	it('manual needs nothing; RC drops parameters left undriven', () => {
		const form = formFor(p, a);
		form.kind = 'manual';
		expect(buildControl(p, a, form)).toEqual({ ok: true, control: { kind: 'manual' } });
		form.kind = 'rc';
		form.receiverId = '7';
		form.channels = { intensity: '3', hue: '', saturation: '', strobe: '' };
		expect(buildControl(p, a, form)).toEqual({
			ok: true,
			control: { kind: 'rc', receiverId: 7, channels: { intensity: 3 } }
		});
		form.channels.hue = '19';
		const r = buildControl(p, a, form);
		expect(!r.ok && r.errors['rc-hue']).toBe('Receiver “Rig” has channels 1–18.');
	});
});

describe('a mode with two DMX breaks (DIN SPEC 15800 DMXBreak)', () => {
	it('gets a row per further break, sent as breaks with their own universe and address', () => {
		const TWO = {
			id: 12,
			name: 'Pixel 2-break',
			slots: 2,
			channels: [
				{ offset: 1, parameter: 'intensity', bits: 8 as const, default: 0 },
				{ offset: 2, parameter: 'cct', bits: 8 as const, default: 0 },
				{ offset: 1, parameter: 'red', bits: 8 as const, default: 0, dmxBreak: 2 },
				{ offset: 2, parameter: 'green', bits: 8 as const, default: 0, dmxBreak: 2 },
				{ offset: 3, parameter: 'blue', bits: 8 as const, default: 0, dmxBreak: 2 }
			]
		};
		const f = fx(201, dmx(1, 1), { modeId: 12, typeId: 3 });
		const p = patchOf([f]);
		p.types.push({ id: 3, maker: 'M', model: 'Pixel', notes: '', version: 1, modes: [TWO] });
		const form = formFor(p, f);
		expect(form.breaks).toEqual([{ dmxBreak: 2, slots: 3, universe: '1', address: '' }]);
		form.breaks[0].universe = '4';
		form.breaks[0].address = '511';
		const refused = buildControl(p, f, form);
		expect(!refused.ok && refused.errors['break-2-address']).toBe(
			'Break 2 needs 3 slots; the last start that fits is 510.'
		);
		form.breaks[0].address = '10';
		expect(buildControl(p, f, form)).toEqual({
			ok: true,
			control: { kind: 'dmx', universeId: 1, address: 1, breaks: [{ dmxBreak: 2, universeId: 2, address: 10 }] }
		});
	});
});

describe('follow', () => {
	it('refuses itself, a follower (naming its leader), a loop, and a leader of others', () => {
		const leader = fx(101, dmx(1, 1));
		const follower = fx(115, { kind: 'follow', leaderId: leader.id });
		const other = fx(120, dmx(1, 50));
		const p = patchOf([leader, follower, other]);
		expect(followProblem(p, other, '120')).toBe('A fixture cannot follow itself.');
		expect(followProblem(p, other, '115')).toBe('Fixture 115 follows 101 itself; follow 101 instead.');
		expect(followProblem(p, leader, '115')).toBe(
			'Fixture 115 follows this one; following it back would make a loop with no leader.'
		);
		expect(followProblem(p, leader, '120')).toBe(
			'Fixture 115 follows this one; a leader cannot follow. Move it first.'
		);
		expect(followProblem(p, other, '999')).toBe('There is no fixture 999 in this project.');
		expect(followProblem(p, other, '101')).toBe(leader.id);
	});

	it('lists followers under their leader and leaves a loop in number order', () => {
		const a = fx(1, dmx(1, 1));
		const b = fx(2, dmx(1, 5));
		const c = fx(3, { kind: 'follow', leaderId: a.id });
		const x = fx(4, { kind: 'follow', leaderId: 0 });
		const y = fx(5, { kind: 'follow', leaderId: x.id });
		(x.control as { leaderId: number }).leaderId = y.id;
		expect(followersUnderLeaders([a, b, c, x, y]).map((f) => f.number)).toEqual([1, 3, 2, 4, 5]);
	});
});

describe('suggestions', () => {
	it('suggests free slots for a map in channel order around what is patched', () => {
		const a = fx(101, dmx(1, 1)); // 1–4
		const b = fx(102, dmx(1, 6)); // 6–9
		const me = fx(103, { kind: 'manual' });
		const p = patchOf([a, b, me]);
		// 5 is free, then 10, 11, 12
		expect(suggestMap(p, me, 1)).toEqual({ intensity: 5, hue: 10, saturation: 11, strobe: 12 });
		// a typed address is kept and not offered again
		expect(suggestMap(p, me, 1, { intensity: '', hue: '5', saturation: '', strobe: '' })).toEqual({
			intensity: 10,
			saturation: 11,
			strobe: 12
		});
	});

	it('a 16-bit parameter is offered only two adjacent free slots', () => {
		const a = fx(101, dmx(1, 1)); // 1–4
		const c = fx(102, dmx(1, 6)); // 6–9: slot 5 alone is too small
		const ball = fx(103, { kind: 'manual' }, { modeId: 11 });
		expect(suggestMap(patchOf([a, c, ball]), ball, 1)).toEqual({ intensity: 10 });
	});

	it('shows RC collisions with other fixtures, but not with a link-group partner on the same parameter', () => {
		const rc = (ch: Record<string, number>): FixtureControl => ({ kind: 'rc', receiverId: 7, channels: ch });
		const a = fx(101, rc({ intensity: 1, hue: 2 }), { linkGroup: 'G' });
		const b = fx(102, rc({ intensity: 4 }));
		const me = fx(103, rc({}), { linkGroup: 'G' });
		const p = patchOf([a, b, me]);
		expect(rcClashes(p, me, 7, { intensity: '1', hue: '4', saturation: '', strobe: '' })).toEqual({
			hue: 'Channel 4 already drives intensity of fixture 102.'
		});
		expect(rcClashes(p, me, 7, { intensity: '2', hue: '', saturation: '', strobe: '' })).toEqual({
			intensity: 'Channel 2 already drives hue of fixture 101.'
		});
		expect(suggestRc(p, me, 7, { intensity: '', hue: '3', saturation: '', strobe: '' })).toEqual({
			intensity: '5',
			hue: '3',
			saturation: '6',
			strobe: '7'
		});
	});
});

describe('link groups and quick fixes', () => {
	it('refuses to link across modes or addresses, with the reason', () => {
		const a = fx(101, dmx(1, 1));
		const b = fx(102, dmx(1, 1));
		const c = fx(103, dmx(1, 9));
		const d = fx(104, dmx(1, 1), { modeId: 11 });
		const p = patchOf([a, b, c, d]);
		expect(linkProblem(p, [a, b])).toBeNull();
		expect(linkProblem(p, [a, c])).toBe(
			'Fixture 103 is at 1.9 and 101 at 1.1; linked units share one universe and address.'
		);
		expect(linkProblem(p, [a, d])).toContain('Fixture 104 runs another mode than 101');
		expect(linkProblem(p, [a])).toBe('Choose at least two fixtures to link.');
	});

	it('moves the later of two overlapping fixtures to the next free run, from its own address on', () => {
		const a = fx(131, dmx(1, 21)); // 21–24
		const b = fx(136, dmx(1, 23)); // 23–26 overlaps
		const c = fx(140, dmx(1, 27)); // 27–30: 25–28 would not fit either
		const p = patchOf([a, b, c]);
		expect(nextFreeAddress(p, b)).toEqual({ universeId: 1, address: 31, slots: 4 });
		const fixes = quickFixesFor(
			p,
			{ kind: 'overlap', severity: 'error', fixtureIds: [a.id, b.id], message: '' },
			new Map(p.fixtures.map((f) => [f.id, f]))
		);
		expect(fixes.map((f) => f.label)).toEqual(['Move 136 to next free address 1.31', 'Set 136 to manual']);
		expect(fixes[0].changes).toEqual([{ id: b.id, version: 1, control: { kind: 'dmx', universeId: 1, address: 31 } }]);
	});

	it('offers a smaller mode of the same type when it fits where the fixture is', () => {
		const SMALL = {
			id: 13,
			name: 'Dimmer 8-bit',
			slots: 1,
			channels: [{ offset: 1, parameter: 'intensity', bits: 8 as const, default: 0 }]
		};
		const a = fx(101, dmx(1, 1), { modeId: 11 }); // 1–2
		const b = fx(102, dmx(1, 3), { modeId: 11 }); // 3–4
		const c = fx(103, dmx(1, 511), { modeId: 11 }); // 511–512
		const d = fx(104, dmx(1, 2), { modeId: 11 }); // 2–3: overlaps both
		const p = patchOf([a, b, c, d]);
		p.types[1].modes.push(SMALL);
		const fixes = quickFixesFor(
			p,
			{ kind: 'overlap', severity: 'error', fixtureIds: [a.id, d.id], message: '' },
			new Map(p.fixtures.map((f) => [f.id, f]))
		);
		// 104 at 2 in one slot still overlaps 101's slot 2, so no mode fix; the move goes to 5–6
		expect(fixes.map((f) => f.label)).toEqual(['Move 104 to next free address 1.5', 'Set 104 to manual']);
		const e = fx(105, dmx(1, 4), { modeId: 11 }); // 4–5 overlaps 102's 4
		const p2 = patchOf([a, c, e, fx(106, dmx(1, 5), { modeId: 11 })]); // 5–6
		p2.types[1].modes.push(SMALL);
		const fixes2 = quickFixesFor(
			p2,
			{ kind: 'overlap', severity: 'error', fixtureIds: [e.id], message: '' },
			new Map(p2.fixtures.map((f) => [f.id, f]))
		);
		expect(fixes2.find((f) => f.label === 'Change 105 to mode Dimmer 8-bit')?.changes).toEqual([
			{ id: e.id, version: 1, modeId: 13 }
		]);
	});

	it('offers to link a shared address under a fresh group name', () => {
		const a = fx(101, dmx(1, 1));
		const b = fx(102, dmx(1, 1));
		const p = patchOf([a, b, fx(103, dmx(1, 9), { linkGroup: 'LINK-1' })]);
		const fixes = quickFixesFor(
			p,
			{ kind: 'shared', severity: 'warning', fixtureIds: [a.id, b.id], message: '' },
			new Map(p.fixtures.map((f) => [f.id, f]))
		);
		expect(fixes[0].label).toBe('Link 101, 102 as LINK-2');
		expect(fixes[0].changes.map((c) => c.linkGroup)).toEqual(['LINK-2', 'LINK-2']);
	});
});
