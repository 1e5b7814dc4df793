import type { FixtureControl } from '../patch/types';

// The state of a start-address editor with one row per DMX break (DIN SPEC 15800 DMX mode: a mode
// may span several breaks, each its own DMX line with its own start address, often on another
// universe). Used by the fixture page; built so the patch table's editor can take it too.

export interface BreakRow {
	dmxBreak: number;
	/** Footprint of this break in slots. */
	slots: number;
	/** Universe id as the select holds it; '' when none is chosen. */
	universeId: string;
	/** Start address as typed. */
	address: string;
}

export interface BreakControl {
	kind: 'dmx';
	universeId: number;
	address: number;
	breaks?: { dmxBreak: number; universeId: number; address: number }[];
}

/** Form field names of a break's row: the server action reads the same names. */
export function breakFieldNames(dmxBreak: number): { universe: string; address: string } {
	return { universe: `universe-${dmxBreak}`, address: `address-${dmxBreak}` };
}

function rowsFrom(
	footprints: readonly { dmxBreak: number; slots: number }[],
	control: FixtureControl | null
): BreakRow[] {
	return footprints.map(({ dmxBreak, slots }) => {
		let universeId: number | null = null;
		let address: number | null = null;
		if (control?.kind === 'dmx') {
			if (dmxBreak === 1) {
				universeId = control.universeId;
				address = control.address || null;
			} else {
				const b = control.breaks?.find((x) => x.dmxBreak === dmxBreak);
				universeId = b?.universeId ?? null;
				address = b?.address ?? null;
			}
		} else if (control?.kind === 'dmx-map' && dmxBreak === 1) universeId = control.universeId;
		return {
			dmxBreak,
			slots,
			universeId: universeId === null ? '' : String(universeId),
			address: address === null ? '' : String(address)
		};
	});
}

/** A row's problem in plain words, or '' — the same rules the server applies (ANSI E1.11: slots 1–512). */
export function rowProblem(row: BreakRow, universeIds?: ReadonlySet<number>): string {
	const a = row.address.trim();
	const name = `Break ${row.dmxBreak}`;
	if (row.universeId === '' && a === '') return `${name} needs a universe and a start address.`;
	if (row.universeId === '') return `Choose a universe for break ${row.dmxBreak}.`;
	if (universeIds && !universeIds.has(Number(row.universeId)))
		return `That universe is gone; choose another for break ${row.dmxBreak}.`;
	if (a === '') return `Give break ${row.dmxBreak} a start address, 1–512.`;
	if (!/^\d+$/.test(a)) return `"${a}" is not an address; write a number from 1 to 512.`;
	const n = Number(a);
	if (n < 1 || n > 512) return `Address ${n} is outside 1–512.`;
	const last = n + row.slots - 1;
	if (last > 512)
		return `${name} needs ${row.slots} slots; from ${n} it would run to slot ${last}, past 512. Start at ${513 - row.slots} or lower.`;
	return '';
}

/** The last slot a row reaches, for "1–6" beside the address; null while the address is not a number. */
export function rowEnd(row: BreakRow): number | null {
	const a = row.address.trim();
	if (!/^\d+$/.test(a) || row.slots === 0) return null;
	return Number(a) + row.slots - 1;
}

export class BreakAddresses {
	rows = $state<BreakRow[]>([]);
	/** Problems the server answered, by break number; cleared when that row changes. */
	serverErrors = $state<Record<number, string>>({});
	/** Whether to show the rows' own problems (after the first attempt to save). */
	tried = $state(false);
	#universeIds: ReadonlySet<number> | undefined;

	constructor(
		footprints: readonly { dmxBreak: number; slots: number }[],
		control: FixtureControl | null,
		universeIds?: ReadonlySet<number>
	) {
		this.rows = rowsFrom(footprints, control);
		this.#universeIds = universeIds;
	}

	/** Starts over from a saved control (after a save or a live update). */
	reset(footprints: readonly { dmxBreak: number; slots: number }[], control: FixtureControl | null): void {
		this.rows = rowsFrom(footprints, control);
		this.serverErrors = {};
		this.tried = false;
	}

	set(dmxBreak: number, field: 'universeId' | 'address', value: string): void {
		const row = this.rows.find((r) => r.dmxBreak === dmxBreak);
		if (!row) return;
		row[field] = value;
		if (this.serverErrors[dmxBreak] !== undefined) {
			const { [dmxBreak]: gone, ...rest } = this.serverErrors;
			void gone;
			this.serverErrors = rest;
		}
	}

	/** The problem to show beside each row: the server's answer first, then the row's own once tried. */
	get errors(): Record<number, string> {
		const out: Record<number, string> = {};
		for (const r of this.rows) {
			const own = this.tried ? rowProblem(r, this.#universeIds) : '';
			const msg = this.serverErrors[r.dmxBreak] ?? own;
			if (msg) out[r.dmxBreak] = msg;
		}
		return out;
	}

	get valid(): boolean {
		return this.rows.length > 0 && this.rows.every((r) => rowProblem(r, this.#universeIds) === '');
	}

	/** The `dmx` control the rows describe (the API's shape), or null while a row has a problem. */
	get control(): BreakControl | null {
		if (!this.valid) return null;
		const [first, ...more] = this.rows;
		const base = { kind: 'dmx' as const, universeId: Number(first.universeId), address: Number(first.address) };
		return more.length === 0
			? base
			: {
					...base,
					breaks: more.map((r) => ({
						dmxBreak: r.dmxBreak,
						universeId: Number(r.universeId),
						address: Number(r.address)
					}))
				};
	}

	/**
	 * Server issues (paths of the fixture API: control.address, control.breaks.0.universeId …) onto
	 * rows; answers the messages no row took, for the form's own line.
	 */
	takeIssues(issues: readonly { path: readonly (string | number)[]; message: string }[]): string[] {
		const byBreak: Record<number, string> = {};
		const rest: string[] = [];
		const further = this.rows.slice(1);
		for (const i of issues) {
			const p = i.path.map(String);
			const at = p.indexOf('control');
			const tail = at >= 0 ? p.slice(at + 1) : p;
			let n: number | undefined;
			const field = /^(universe|address)-(\d+)$/.exec(tail[0] ?? '');
			if (field) n = Number(field[2]);
			else if (tail[0] === 'universeId' || tail[0] === 'address') n = 1;
			else if (tail[0] === 'breaks' && /^\d+$/.test(tail[1] ?? '')) n = further[Number(tail[1])]?.dmxBreak;
			if (n !== undefined && this.rows.some((r) => r.dmxBreak === n)) byBreak[n] ??= i.message;
			else rest.push(i.message);
		}
		this.serverErrors = byBreak;
		return rest;
	}
}
