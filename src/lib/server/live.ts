import { loadPatchCached, type PatchData } from './db/patch';
import { RateLimitedError } from './errors';

// Live updates (server-sent events, WHATWG HTML "Server-sent events"): after each committed
// write a route calls publish(); every open table and universe map of that project gets the
// changed rows, the ids that went away, the conflicts as they now stand and the project's change
// counter. A client that sees a counter jump has missed something and refetches.
// One process holds the subscribers (Patchwright runs as one Node process over one SQLite file).

export interface LiveEvent {
	counter: number;
	fixtures: PatchData['fixtures'];
	deleted: number[];
	conflicts: PatchData['conflicts'];
	/** who wrote, so a client can tell its own save from someone else's */
	by: string;
	/** a change too wide to send as rows (an import): clients refetch */
	refetch: boolean;
}

type Listener = (e: LiveEvent) => void;
const listeners = new Map<number, Set<Listener>>();
const counters = new Map<number, number>();
/** unique per server start: a client reconnecting to a restarted server refetches */
export const LIVE_EPOCH = Date.now().toString(36);

export function liveCounter(projectId: number): number {
	return counters.get(projectId) ?? 0;
}

export function subscribe(projectId: number, fn: Listener): () => void {
	let set = listeners.get(projectId);
	if (!set) listeners.set(projectId, (set = new Set()));
	set.add(fn);
	return () => {
		set.delete(fn);
		if (set.size === 0) listeners.delete(projectId);
	};
}

/** Call after the write has committed: the rows are read back with their computed slots. */
export function publish(
	projectId: number,
	change: { ids?: number[]; deleted?: number[]; by: string; refetch?: boolean }
): void {
	const counter = liveCounter(projectId) + 1;
	counters.set(projectId, counter);
	const set = listeners.get(projectId);
	if (!set?.size) return;
	const patch = loadPatchCached(projectId);
	const wanted = new Set(change.ids ?? []);
	const event: LiveEvent = {
		counter,
		fixtures: wanted.size ? patch.fixtures.filter((f) => wanted.has(f.id)) : [],
		deleted: change.deleted ?? [],
		conflicts: patch.conflicts,
		by: change.by,
		refetch: change.refetch ?? false
	};
	for (const fn of set) fn(event);
}

// Each open feed holds a socket, a listener and a timer for as long as its page stays open, so
// they are counted: per person (several tabs and phones are normal; hundreds are a script) and in all.
export const LIVE_PER_USER = Number(process.env.PATCHWRIGHT_LIVE_PER_USER || 16);
export const LIVE_TOTAL = Number(process.env.PATCHWRIGHT_LIVE_TOTAL || 1000);
const openByUser = new Map<string, number>();
let openTotal = 0;

/** Counts one open feed, or refuses it (429) past either bound; the answer releases it (once). */
export function openFeed(userId: string): () => void {
	const mine = openByUser.get(userId) ?? 0;
	if (mine >= LIVE_PER_USER)
		throw new RateLimitedError(
			`You already have ${mine} live pages open; close a few tabs or windows of Patchwright and reload this one.`,
			30
		);
	if (openTotal >= LIVE_TOTAL)
		throw new RateLimitedError(
			`The server is keeping ${openTotal} live pages up to date, as many as it takes; reload in a minute.`,
			60
		);
	openByUser.set(userId, mine + 1);
	openTotal++;
	let open = true;
	return () => {
		if (!open) return;
		open = false;
		openTotal--;
		const left = (openByUser.get(userId) ?? 1) - 1;
		if (left > 0) openByUser.set(userId, left);
		else openByUser.delete(userId);
	};
}
