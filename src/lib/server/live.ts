import { loadPatchCached, type PatchData } from './db/patch';

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
