import { UNIVERSE_SLOTS } from './footprint';

// The patch table's bulk tools as pure rules: label patterns, a run of new fixtures laid end to
// end from one address, and renumbering a selection. The server applies them in one transaction;
// the page uses the same functions to warn before anything is sent.

/** Most fixtures one bulk action adds or changes (one request, one transaction). */
export const BULK_MAX = 5000;

const TOKEN = /\{(n|i)(?::(0\d?|\d))?\}/g;

/**
 * A label from a pattern: `{n}` is the fixture number, `{i}` counts 1…N through the batch;
 * `{n:03}` pads to 3 digits with zeros. Text without a token gets nothing added.
 */
export function formatLabel(pattern: string, values: { n: number; i: number }): string {
	return pattern.replace(TOKEN, (_m, key: 'n' | 'i', width?: string) => {
		const v = String(values[key]);
		const w = width === undefined ? 0 : Number(width);
		return w > v.length ? v.padStart(w, '0') : v;
	});
}

export interface RunFit {
	/** how many of the run fit before slot 512 */
	fits: number;
	/** the highest start address from which all of them fit, or null if they cannot fit in one universe */
	latestStart: number | null;
	/** plain words when not all fit, else null */
	message: string | null;
}

/**
 * `count` fixtures of `slots` slots each laid end to end from `address`. A footprint never wraps
 * into the next universe (ANSI E1.11: slots 1–512), so a run that would pass 512 is refused
 * with how many fit and where to start instead.
 */
export function fitRun(count: number, slots: number, address: number): RunFit {
	const width = Math.max(1, slots);
	const room = UNIVERSE_SLOTS - address + 1;
	const fits = room <= 0 ? 0 : Math.min(count, Math.floor(room / width));
	const total = count * width;
	const latestStart = total <= UNIVERSE_SLOTS ? UNIVERSE_SLOTS - total + 1 : null;
	if (fits === count) return { fits, latestStart, message: null };
	const each = `${width} slot${width === 1 ? '' : 's'} each`;
	const what = `${count} fixture${count === 1 ? '' : 's'} of ${each}`;
	const head =
		fits === 0
			? `None of ${what} fits from ${address} in a 512-slot universe`
			: `Only ${fits} of ${what} ${fits === 1 ? 'fits' : 'fit'} from ${address} in a 512-slot universe`;
	const tryThis =
		latestStart !== null
			? `start at ${latestStart} or lower, or add ${fits === 0 ? 'fewer' : fits}`
			: `at most ${Math.floor(UNIVERSE_SLOTS / width)} fit in one universe: add ${Math.floor(UNIVERSE_SLOTS / width)} here and the rest in another universe, or leave them unpatched`;
	return { fits, latestStart, message: `${head}; ${tryThis}.` };
}

/**
 * New numbers for a selection, kept in its current number order: the lowest becomes `from`,
 * the next `from + step`, and so on.
 */
export function renumberPlan(
	chosen: readonly { id: number; number: number }[],
	from: number,
	step: number
): { id: number; number: number }[] {
	return [...chosen].sort((a, b) => a.number - b.number).map((f, i) => ({ id: f.id, number: from + i * step }));
}
