import type { AssignRcResult } from '$lib/patch';

// What an auto-assign would do (or did), counted the way a programmer reads a transmitter:
// channels are distinct channel numbers; a link group shares its channels, so it uses fewer
// channels than it has parameters (issue 18: "Assigned 16 channel(s)" when 12 were used).

interface FixtureLike {
	id: number;
	number: number;
	label: string;
	control: { kind: string; channels?: Record<string, number> };
}

export interface AssignRow {
	number: number;
	label: string;
	parameter: string;
	from: number | null;
	to: number | null;
}

export interface AssignSummary {
	receiverId: number;
	keepExisting: boolean;
	channels: number;
	parameters: number;
	fixtures: number;
	kept: number;
	changed: number;
	rows: AssignRow[];
	unassigned: { number: number; parameter: string; reason: string }[];
}

export function summarizeAssign(
	receiverId: number,
	before: readonly FixtureLike[],
	result: AssignRcResult,
	keepExisting: boolean
): AssignSummary {
	const byId = new Map(before.map((f) => [f.id, f]));
	const current = (id: number, parameter: string): number | null => {
		const f = byId.get(id);
		return f?.control.kind === 'rc' ? (f.control.channels?.[parameter] ?? null) : null;
	};
	const rows: AssignRow[] = result.assigned.map((a) => ({
		number: byId.get(a.fixtureId)?.number ?? 0,
		label: byId.get(a.fixtureId)?.label ?? '',
		parameter: a.parameter,
		from: current(a.fixtureId, a.parameter),
		to: a.channel
	}));
	const kept = rows.filter((r) => r.from === r.to).length;
	return {
		receiverId,
		keepExisting,
		channels: new Set(result.assigned.map((a) => a.channel)).size,
		parameters: result.assigned.length,
		fixtures: new Set(result.assigned.map((a) => a.fixtureId)).size,
		kept,
		changed: rows.length - kept,
		rows,
		unassigned: result.unassigned.map((u) => ({
			number: byId.get(u.fixtureId)?.number ?? 0,
			parameter: u.parameter,
			reason: u.reason
		}))
	};
}
