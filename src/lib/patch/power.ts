// Power and batteries: what each pack and circuit carries, how long it lasts, and the day's
// battery rotation (issue 15). Pure: plain data in, plain data out; the API, the pages and the
// power sheet all call computePower.

import type { Chemistry } from '../vocab';
export type { Chemistry } from '../vocab';

export interface CellVolts {
	nominal: number;
	full: number;
	empty: number;
}

// Per-cell voltages, common practice (from memory, not a standard): Li-ion 3.6 V nominal,
// 4.2 V charged, 3.0 V cut-off; LiPo 3.7 / 4.2 / 3.0 V; LiFePO4 3.2 / 3.65 / 2.5 V.
export const CELL_VOLTS: Record<Chemistry, CellVolts> = {
	'li-ion': { nominal: 3.6, full: 4.2, empty: 3.0 },
	lipo: { nominal: 3.7, full: 4.2, empty: 3.0 },
	lifepo4: { nominal: 3.2, full: 3.65, empty: 2.5 }
};

// IATA lithium battery guidance: above 100 Wh needs the airline's approval, above 160 Wh
// may not travel as passenger baggage.
export const AIR_APPROVAL_WH = 100;
export const AIR_FORBIDDEN_WH = 160;
// NEC 210.19(A) / 210.20(A) practice: a continuous load (3 h or more) stays within 80 % of the
// breaker. Local codes differ.
export const CONTINUOUS_LOAD_FRACTION = 0.8;
// Common practice: LED drivers run at a power factor around 0.9.
export const DEFAULT_POWER_FACTOR = 0.9;
// Common practice: plan on 85 % of a pack's rated energy (cut-off margin, ageing, cold).
export const DEFAULT_USABLE_FRACTION = 0.85;
// Common practice: electronics and fan draw about a tenth of full power at zero intensity.
export const DEFAULT_DRAW_FLOOR = 0.1;

export const POWER_WARNING_CODES = [
	'over-current',
	'voltage-range',
	'air-travel-approval',
	'air-travel-forbidden',
	'circuit-over-80',
	'circuit-over-100',
	'no-power-data'
] as const;
export type PowerWarningCode = (typeof POWER_WARNING_CODES)[number];
/** What people read on pages and sheets; the codes stay in the API. */
export const POWER_WARNING_LABELS: Record<PowerWarningCode, string> = {
	'over-current': 'More current than the pack gives',
	'voltage-range': "Outside the fixture's voltage range",
	'air-travel-approval': "Flying needs the airline's approval",
	'air-travel-forbidden': 'Not allowed as passenger baggage',
	'circuit-over-80': 'Circuit above 80 %',
	'circuit-over-100': 'Breaker will trip',
	'no-power-data': 'No draw known'
};
/** Errors stop the plan working (a tripped breaker, a pack that cannot feed or fly); the rest are warnings. */
export function powerWarningSeverity(code: PowerWarningCode): 'error' | 'warning' {
	return code === 'circuit-over-100' || code === 'over-current' || code === 'air-travel-forbidden'
		? 'error'
		: 'warning';
}
export interface PowerWarning {
	code: PowerWarningCode;
	message: string;
	fixtureId?: number;
}

export type Feed = { kind: 'battery'; packTypeId: number } | { kind: 'mains'; circuitId: number } | { kind: 'none' };

export interface PackTypeInput {
	id: number;
	name: string;
	chemistry: Chemistry;
	cells: number;
	ampHours: number | null;
	wattHours: number | null;
	maxCurrentA: number;
	onHand: number;
	chargeHours: number | null;
	chargers: number;
	chargerBays: number;
}

export interface CircuitInput {
	id: number;
	name: string;
	volts: number;
	breakerA: number;
	powerFactor: number;
}

export interface PowerFixtureInput {
	id: number;
	number: number;
	label: string;
	/** draw at full output: the fixture's own watts, else its mode's; null when neither is known */
	drawFullW: number | null;
	/** fraction of full draw at zero intensity (the type's floor) */
	drawFloor: number;
	/** planned look intensity 0–100; null: plan at full */
	intensity: number | null;
	inputVolts: { min: number; max: number } | null;
	feed: Feed;
}

export interface PowerInput {
	fixtures: PowerFixtureInput[];
	packTypes: PackTypeInput[];
	circuits: CircuitInput[];
	usableFraction: number;
	/** "HH:MM"; a wrap before the start is the next morning */
	dayStart: string;
	dayWrap: string;
}

const round = (x: number, places = 2) => Math.round(x * 10 ** places) / 10 ** places;

export function packVolts(chemistry: Chemistry, cells: number): CellVolts {
	const c = CELL_VOLTS[chemistry];
	// cells in series add their voltages
	return { nominal: round(c.nominal * cells), full: round(c.full * cells), empty: round(c.empty * cells) };
}

/** Ah and Wh of a pack from whichever was given: Wh = Ah × nominal V. */
export function packEnergy(p: Pick<PackTypeInput, 'chemistry' | 'cells' | 'ampHours' | 'wattHours'>): {
	ampHours: number;
	wattHours: number;
} {
	const v = packVolts(p.chemistry, p.cells).nominal;
	if (p.wattHours != null) return { wattHours: round(p.wattHours), ampHours: round(p.wattHours / v, 3) };
	const ah = p.ampHours ?? 0;
	return { ampHours: ah, wattHours: round(ah * v) };
}

/**
 * Draw at a look intensity. Common practice for LED engines: the LED share scales linearly with
 * intensity, electronics and fan stay on (the floor): W = full × (floor + (1 − floor) × i).
 */
export function drawAt(fullW: number, intensity: number | null, floor: number): number {
	if (intensity == null) return fullW;
	const i = Math.min(100, Math.max(0, intensity)) / 100;
	const f = Math.min(1, Math.max(0, floor));
	return fullW * (f + (1 - f) * i);
}

/** Minutes a pack runs a draw: usable Wh ÷ W. */
export function runtimeMinutes(wattHours: number, usableFraction: number, drawW: number): number | null {
	if (drawW <= 0) return null;
	return (wattHours * usableFraction * 60) / drawW;
}

/** Current through a circuit: I = P ÷ (V × PF). */
export function circuitCurrent(loadW: number, volts: number, powerFactor: number): number {
	return loadW / (volts * powerFactor);
}

export function airTravel(wattHours: number): 'ok' | 'approval' | 'forbidden' {
	if (wattHours > AIR_FORBIDDEN_WH) return 'forbidden';
	if (wattHours > AIR_APPROVAL_WH) return 'approval';
	return 'ok';
}

// ── Time of day ────────────────────────────────────────────────────────────

export function parseClock(s: string): number {
	const m = /^([01]?\d|2[0-3]):([0-5]\d)$/.exec(s);
	if (!m) throw new Error(`Not a time of day: ${s}`);
	return Number(m[1]) * 60 + Number(m[2]);
}

export function formatClock(minutes: number): string {
	const m = ((Math.round(minutes) % 1440) + 1440) % 1440;
	return `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;
}

/** Start and wrap as minutes; a wrap at or before the start is the next morning. */
export function dayWindow(start: string, wrap: string): { start: number; wrap: number } {
	const s = parseClock(start);
	let w = parseClock(wrap);
	if (w <= s) w += 1440;
	return { start: s, wrap: w };
}

// ── Battery rotation ───────────────────────────────────────────────────────

export interface RotationFixture {
	id: number;
	/** minutes one charged pack runs this fixture at its planned look */
	runtimeMin: number;
}

export interface RotationPack {
	onHand: number;
	/** null: no charging during the day */
	chargeHours: number | null;
	/** charging slots: chargers × bays */
	slots: number;
}

export interface RotationEvent {
	fixtureId: number;
	/** minutes from midnight of the start day */
	at: number;
	kind: 'start' | 'swap' | 'dark' | 'relit';
}

export interface RotationResult {
	/** first minute each fixture that ran out waited for a charged pack */
	darkAt: Map<number, number>;
	darkMinutes: Map<number, number>;
	events: RotationEvent[];
	swaps: number;
}

/**
 * One day of swaps. Every fixture starts on a charged pack at the start; when a pack runs out it
 * takes the next charged pack (first come, first served) and the flat one goes on the first free
 * charger bay. A fixture with no charged pack waits dark until one is ready.
 */
export function simulateRotation(
	fixtures: RotationFixture[],
	pack: RotationPack,
	start: number,
	wrap: number
): RotationResult {
	const darkAt = new Map<number, number>();
	const darkMinutes = new Map<number, number>();
	const events: RotationEvent[] = [];
	let charged = Math.max(0, Math.floor(pack.onHand));
	const bays: number[] = Array.from({ length: Math.max(0, Math.floor(pack.slots)) }, () => start);
	const chargeMin = pack.chargeHours != null && pack.chargeHours > 0 && bays.length > 0 ? pack.chargeHours * 60 : null;
	// kind 0: a pack comes off charge; kind 1: a fixture needs a pack. At equal times a pack that
	// is ready serves the fixture that needs it; then fixtures in number order.
	type Ev = { t: number; kind: 0 | 1; seq: number; i: number; first: boolean };
	const queue: Ev[] = fixtures.map((_, i) => ({ t: start, kind: 1, seq: i, i, first: true }));
	let seq = fixtures.length;
	const waiting: { i: number; since: number }[] = [];
	let swaps = 0;
	const next = () => {
		let best = 0;
		for (let k = 1; k < queue.length; k++) {
			const a = queue[k]!;
			const b = queue[best]!;
			if (a.t < b.t || (a.t === b.t && (a.kind < b.kind || (a.kind === b.kind && a.seq < b.seq)))) best = k;
		}
		return queue.splice(best, 1)[0]!;
	};
	const run = (i: number, t: number) =>
		queue.push({ t: t + fixtures[i]!.runtimeMin, kind: 1, seq: seq++, i, first: false });
	while (queue.length > 0) {
		const ev = next();
		if (ev.t >= wrap) break;
		if (ev.kind === 0) {
			const w = waiting.shift();
			if (!w) {
				charged++;
				continue;
			}
			const id = fixtures[w.i]!.id;
			darkMinutes.set(id, (darkMinutes.get(id) ?? 0) + (ev.t - w.since));
			events.push({ fixtureId: id, at: ev.t, kind: 'relit' });
			swaps++;
			run(w.i, ev.t);
			continue;
		}
		const id = fixtures[ev.i]!.id;
		// the flat pack goes on the first free charger bay
		if (!ev.first && chargeMin != null) {
			bays.sort((a, b) => a - b);
			bays[0] = Math.max(ev.t, bays[0]!) + chargeMin;
			queue.push({ t: bays[0], kind: 0, seq: seq++, i: -1, first: false });
		}
		if (charged > 0) {
			charged--;
			if (!ev.first) swaps++;
			events.push({ fixtureId: id, at: ev.t, kind: ev.first ? 'start' : 'swap' });
			run(ev.i, ev.t);
			continue;
		}
		if (!darkAt.has(id)) darkAt.set(id, ev.t);
		events.push({ fixtureId: id, at: ev.t, kind: 'dark' });
		waiting.push({ i: ev.i, since: ev.t });
	}
	for (const w of waiting) {
		const id = fixtures[w.i]!.id;
		darkMinutes.set(id, (darkMinutes.get(id) ?? 0) + (wrap - w.since));
	}
	return { darkAt, darkMinutes, events, swaps };
}

/** The fewest extra charged packs at the start that keep every fixture lit to the wrap. */
export function packsShort(fixtures: RotationFixture[], pack: RotationPack, start: number, wrap: number): number {
	const clean = (extra: number) =>
		simulateRotation(fixtures, { ...pack, onHand: pack.onHand + extra }, start, wrap).darkAt.size === 0;
	if (clean(0)) return 0;
	// enough for every swap of the day with no charging at all
	let hi = fixtures.reduce((n, f) => n + Math.ceil((wrap - start) / Math.max(f.runtimeMin, 1)), 0);
	let lo = 0;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (clean(mid)) hi = mid;
		else lo = mid;
	}
	return hi;
}

// ── The whole project ──────────────────────────────────────────────────────

export interface PackFixtureFigures {
	fixtureId: number;
	number: number;
	label: string;
	/** draw at the planned look (W) */
	drawW: number | null;
	drawFullW: number | null;
	/** at full draw and the pack's end-of-discharge voltage: the worst case */
	currentA: number | null;
	/** at the planned look */
	runtimeMin: number | null;
	runtimeFullMin: number | null;
}

export interface PackFigures {
	id: number;
	name: string;
	chemistry: Chemistry;
	cells: number;
	ampHours: number;
	wattHours: number;
	nominalVolts: number;
	fullVolts: number;
	emptyVolts: number;
	maxCurrentA: number;
	onHand: number;
	chargeHours: number | null;
	chargerSlots: number;
	airTravel: 'ok' | 'approval' | 'forbidden';
	fixtures: PackFixtureFigures[];
	/** extra charged packs that keep every fixture on this pack lit to the wrap */
	packsShort: number;
	warnings: PowerWarning[];
}

export interface CircuitFigures {
	id: number;
	name: string;
	volts: number;
	breakerA: number;
	powerFactor: number;
	loadW: number;
	currentA: number;
	percentOfBreaker: number;
	fixtureIds: number[];
	warnings: PowerWarning[];
}

export interface Shortfall {
	fixtureId: number;
	number: number;
	packTypeId: number;
	darkAt: string;
	/** minutes from the day's start */
	darkAfterMin: number;
	packsShort: number;
	message: string;
}

export interface PowerResult {
	packTypes: PackFigures[];
	circuits: CircuitFigures[];
	day: {
		start: string;
		wrap: string;
		minutes: number;
		shortfalls: Shortfall[];
		/** swaps, darkness and relighting per fixture, minutes from the day's start */
		timeline: { fixtureId: number; number: number; packTypeId: number; events: { at: number; kind: string }[] }[];
	};
	warnings: PowerWarning[];
}

const fixtureName = (f: PowerFixtureInput) => `fixture ${f.number}${f.label ? ` (${f.label})` : ''}`;

export function computePower(input: PowerInput): PowerResult {
	const window = dayWindow(input.dayStart, input.dayWrap);
	const shortfalls: Shortfall[] = [];
	const timeline: PowerResult['day']['timeline'] = [];
	const warnings: PowerWarning[] = [];
	const byNumber = [...input.fixtures].sort((a, b) => a.number - b.number);

	const packTypes = input.packTypes.map((p): PackFigures => {
		const v = packVolts(p.chemistry, p.cells);
		const e = packEnergy(p);
		const w: PowerWarning[] = [];
		const air = airTravel(e.wattHours);
		if (air === 'forbidden')
			w.push({
				code: 'air-travel-forbidden',
				message: `${e.wattHours} Wh is above 160 Wh: not allowed as passenger baggage (IATA). Ship it as cargo.`
			});
		else if (air === 'approval')
			w.push({
				code: 'air-travel-approval',
				message: `${e.wattHours} Wh is above 100 Wh: flying with it needs the airline's approval (IATA).`
			});
		const fed = byNumber.filter((f) => f.feed.kind === 'battery' && f.feed.packTypeId === p.id);
		const figures = fed.map((f): PackFixtureFigures => {
			if (f.drawFullW == null) {
				w.push({
					code: 'no-power-data',
					fixtureId: f.id,
					message: `No draw known for ${fixtureName(f)}: give its mode or the fixture a wattage.`
				});
				return {
					fixtureId: f.id,
					number: f.number,
					label: f.label,
					drawW: null,
					drawFullW: null,
					currentA: null,
					runtimeMin: null,
					runtimeFullMin: null
				};
			}
			const drawW = drawAt(f.drawFullW, f.intensity, f.drawFloor);
			const currentA = f.drawFullW / v.empty;
			if (currentA > p.maxCurrentA)
				w.push({
					code: 'over-current',
					fixtureId: f.id,
					message: `${fixtureName(f)} draws ${round(currentA, 1)} A at ${v.empty} V (end of discharge); the pack gives ${p.maxCurrentA} A continuous.`
				});
			if (f.inputVolts && (v.empty < f.inputVolts.min || v.full > f.inputVolts.max))
				w.push({
					code: 'voltage-range',
					fixtureId: f.id,
					message: `The pack runs ${v.empty}–${v.full} V; ${fixtureName(f)} accepts ${f.inputVolts.min}–${f.inputVolts.max} V.`
				});
			const rt = runtimeMinutes(e.wattHours, input.usableFraction, drawW);
			const rtFull = runtimeMinutes(e.wattHours, input.usableFraction, f.drawFullW);
			return {
				fixtureId: f.id,
				number: f.number,
				label: f.label,
				drawW: round(drawW, 1),
				drawFullW: f.drawFullW,
				currentA: round(currentA, 3),
				runtimeMin: rt == null ? null : round(rt, 1),
				runtimeFullMin: rtFull == null ? null : round(rtFull, 1)
			};
		});
		const rotation: RotationFixture[] = [];
		const rotationFx: PowerFixtureInput[] = [];
		for (const f of fed) {
			const fig = figures.find((x) => x.fixtureId === f.id)!;
			// a fixture that draws nothing needs no packs; an unknown draw is already flagged
			if (fig.drawW == null || fig.drawW <= 0) continue;
			rotation.push({ id: f.id, runtimeMin: runtimeMinutes(e.wattHours, input.usableFraction, fig.drawW)! });
			rotationFx.push(f);
		}
		const pack: RotationPack = {
			onHand: p.onHand,
			chargeHours: p.chargeHours,
			slots: p.chargers * p.chargerBays
		};
		const sim = simulateRotation(rotation, pack, window.start, window.wrap);
		const short = sim.darkAt.size > 0 ? packsShort(rotation, pack, window.start, window.wrap) : 0;
		for (const f of rotationFx) {
			timeline.push({
				fixtureId: f.id,
				number: f.number,
				packTypeId: p.id,
				events: sim.events
					.filter((ev) => ev.fixtureId === f.id)
					.map((ev) => ({ at: Math.round(ev.at - window.start), kind: ev.kind }))
			});
			const at = sim.darkAt.get(f.id);
			if (at === undefined) continue;
			shortfalls.push({
				fixtureId: f.id,
				number: f.number,
				packTypeId: p.id,
				darkAt: formatClock(at),
				darkAfterMin: at - window.start,
				packsShort: short,
				message: `Fixture ${f.number} goes dark at ${formatClock(at)} unless ${short === 1 ? 'one more pack is' : `${short} more packs are`} charged.`
			});
		}
		return {
			id: p.id,
			name: p.name,
			chemistry: p.chemistry,
			cells: p.cells,
			ampHours: e.ampHours,
			wattHours: e.wattHours,
			nominalVolts: v.nominal,
			fullVolts: v.full,
			emptyVolts: v.empty,
			maxCurrentA: p.maxCurrentA,
			onHand: p.onHand,
			chargeHours: p.chargeHours,
			chargerSlots: pack.slots,
			airTravel: air,
			fixtures: figures,
			packsShort: short,
			warnings: w
		};
	});

	const circuits = input.circuits.map((c): CircuitFigures => {
		const fed = byNumber.filter((f) => f.feed.kind === 'mains' && f.feed.circuitId === c.id);
		const w: PowerWarning[] = [];
		let loadW = 0;
		for (const f of fed) {
			if (f.drawFullW == null) {
				w.push({
					code: 'no-power-data',
					fixtureId: f.id,
					message: `No draw known for ${fixtureName(f)}: give its mode or the fixture a wattage.`
				});
				continue;
			}
			// breakers see what the fixture can draw, not the planned look: plan at full
			loadW += f.drawFullW;
		}
		const currentA = circuitCurrent(loadW, c.volts, c.powerFactor);
		const percent = (currentA / c.breakerA) * 100;
		if (percent > 100)
			w.push({
				code: 'circuit-over-100',
				message: `${round(currentA, 1)} A is more than the ${c.breakerA} A breaker: it will trip.`
			});
		else if (percent > CONTINUOUS_LOAD_FRACTION * 100)
			w.push({
				code: 'circuit-over-80',
				message: `${round(currentA, 1)} A is above 80 % of the ${c.breakerA} A breaker (${round(CONTINUOUS_LOAD_FRACTION * c.breakerA, 1)} A) for a continuous load (NEC 210.19(A)/210.20(A) practice; local codes differ).`
			});
		return {
			id: c.id,
			name: c.name,
			volts: c.volts,
			breakerA: c.breakerA,
			powerFactor: c.powerFactor,
			loadW: round(loadW, 1),
			currentA: round(currentA, 2),
			percentOfBreaker: round(percent, 1),
			fixtureIds: fed.map((f) => f.id),
			warnings: w
		};
	});

	shortfalls.sort((a, b) => a.darkAfterMin - b.darkAfterMin || a.number - b.number);
	for (const p of packTypes) warnings.push(...p.warnings);
	for (const c of circuits) warnings.push(...c.warnings);
	return {
		packTypes,
		circuits,
		day: {
			start: formatClock(window.start),
			wrap: formatClock(window.wrap),
			minutes: window.wrap - window.start,
			shortfalls,
			timeline
		},
		warnings
	};
}
