import { cctSwatch, hsiSwatch, type Conflict, type SlotRange } from '$lib/patch';
import type { FixtureShape, PatchData, ReceiverShape, TypeShape, UniverseShape } from './shapes';

// Presentation helpers shared by the patch pages: how a fixture's control,
// slots and look read on screen. The arithmetic stays in the engine.

export type PatchFixtureView = PatchData['fixtures'][number];

/** A text mark per state so colour is never the only signal. */
export const STATE_MARK: Record<string, string> = {
	planned: '○',
	hung: '◐',
	addressed: '◑',
	checked: '●',
	fault: '✕'
};
export const STATE_CLASS: Record<string, string> = {
	planned: 'text-muted',
	hung: 'text-info',
	addressed: 'text-brand',
	checked: 'text-ok',
	fault: 'text-bad'
};

export interface Lookups {
	universes: Map<number, UniverseShape>;
	receivers: Map<number, ReceiverShape>;
	fixtures: Map<number, FixtureShape>;
	modes: Map<number, { type: TypeShape; mode: TypeShape['modes'][number] }>;
}

export function lookups(p: Pick<PatchData, 'universes' | 'receivers' | 'fixtures' | 'types'>): Lookups {
	const modes = new Map<number, { type: TypeShape; mode: TypeShape['modes'][number] }>();
	for (const t of p.types) for (const m of t.modes) modes.set(m.id, { type: t, mode: m });
	return {
		universes: new Map(p.universes.map((u) => [u.id, u])),
		receivers: new Map(p.receivers.map((r) => [r.id, r])),
		fixtures: new Map(p.fixtures.map((f) => [f.id, f])),
		modes
	};
}

export function typeModeText(f: FixtureShape, l: Lookups): string {
	const m = l.modes.get(f.modeId);
	return m ? `${m.type.maker} ${m.type.model} · ${m.mode.name}` : '(unknown mode)';
}

/** "2.101", "RC Mast RX ch 1–4", "follows 12", "manual". */
export function controlText(f: FixtureShape, l: Lookups): string {
	const c = f.control;
	switch (c.kind) {
		case 'dmx': {
			const u = c.universeId != null ? l.universes.get(c.universeId) : undefined;
			return u ? `${u.number}.${c.address}` : `—.${c.address}`;
		}
		case 'dmx-map': {
			const u = c.universeId != null ? l.universes.get(c.universeId) : undefined;
			const addrs = Object.values(c.addresses).sort((a, b) => a - b);
			return `${u ? u.number : '—'}: ${addrs.join(', ')} (per parameter)`;
		}
		case 'rc': {
			const r = c.receiverId != null ? l.receivers.get(c.receiverId) : undefined;
			const ch = Object.values(c.channels).sort((a, b) => a - b);
			return `RC ${r?.name ?? '(no receiver)'} ch ${ch.length ? ch.join(', ') : '—'}`;
		}
		case 'follow': {
			const leader = l.fixtures.get(c.leaderId);
			return `follows ${leader ? `${leader.number} ${leader.label}` : '(missing leader)'}`;
		}
		default:
			return 'manual';
	}
}

export function slotsText(slots: readonly SlotRange[]): string {
	return slots.map((r) => (r.start === r.end ? `${r.start}` : `${r.start}–${r.end}`)).join(', ');
}

/** The screen preview of the fixture's planned look; null when nothing is planned. */
export function swatchOf(f: FixtureShape): string | null {
	const { hue, saturation, intensity, cct } = f.look;
	if (hue != null && saturation != null && saturation > 0) return hsiSwatch(hue, saturation, intensity ?? 100);
	if (cct != null) return cctSwatch(cct, intensity ?? 100);
	if (hue != null) return hsiSwatch(hue, saturation ?? 0, intensity ?? 100);
	return null;
}

export function conflictsByFixture(conflicts: Conflict[]): Map<number, Conflict[]> {
	const map = new Map<number, Conflict[]>();
	for (const c of conflicts) for (const id of c.fixtureIds) map.set(id, [...(map.get(id) ?? []), c]);
	return map;
}
