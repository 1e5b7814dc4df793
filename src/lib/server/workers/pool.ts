import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { Piscina } from 'piscina';
import { JobRefusedError, type Issue } from '../errors';
import type { Refusal, Task } from './tasks';

// Heavy work off the request loop (DESIGN "no request can stall the server"): CSV decoding and
// parsing, GDTF parsing and PDF rendering run in a small pool of worker threads, each job with a
// time budget and each thread with a heap cap. A job over budget is stopped — its thread is
// replaced — and the request answers 413/422 while every other request carries on.
//
// The worker runs entry.mjs (which loads tasks.ts through tsx) from the app's directory: that file
// exists wherever the app runs (`npm run serve` and the tests start from the repository; the built
// server under build/ imports nothing from it), so no bundler has to know about it.

/** wall-clock budget of one job */
export const JOB_TIME_MS = Number(process.env.PATCHWRIGHT_JOB_TIME_MS || 30_000);
/** old-generation heap of one worker thread */
export const JOB_HEAP_MB = Number(process.env.PATCHWRIGHT_JOB_HEAP_MB || 512);

/** heavy jobs one person (or one review link) may have waiting or running at once */
export const JOBS_PER_OWNER = Math.max(1, Number(process.env.PATCHWRIGHT_JOBS_PER_OWNER || 2));
/** jobs waiting for a thread, server-wide: past it a new job is refused at once, not queued for minutes */
export const MAX_WAITING_JOBS = 32;

let pool: Piscina | undefined;
// jobs in flight per owner: one person's uploads and sheets cannot fill the pool everyone shares
const inFlight = new Map<string, number>();

export function workerFile(): string {
	return resolve(process.env.PATCHWRIGHT_APP_DIR || '.', 'src/lib/server/workers/entry.mjs');
}

function thePool(): Piscina {
	if (pool) return pool;
	const filename = workerFile();
	if (!existsSync(filename))
		throw new Error(`worker file missing: ${filename} (start the server from the app directory)`);
	pool = new Piscina({
		filename,
		minThreads: 1,
		// two cores on a set laptop: one thread for sheets and imports leaves one for requests
		maxThreads: Math.max(1, Number(process.env.PATCHWRIGHT_WORKERS || 2)),
		idleTimeout: 60_000,
		maxQueue: MAX_WAITING_JOBS,
		resourceLimits: { maxOldGenerationSizeMb: JOB_HEAP_MB, maxYoungGenerationSizeMb: 64 }
	});
	return pool;
}

function isRefusal(v: unknown): v is Refusal {
	return typeof v === 'object' && v !== null && 'refused' in v;
}

/**
 * Runs one job in a worker for `owner` (a user id, or a review link); refusals come back as a
 * JobRefusedError with the worker error's status, budgets answer 413/422, an owner with
 * JOBS_PER_OWNER jobs in flight 429, a full queue 503.
 */
export async function runJob<T>(task: Task, what: string, owner: string): Promise<T> {
	const mine = inFlight.get(owner) ?? 0;
	if (mine >= JOBS_PER_OWNER)
		throw new JobRefusedError(
			429,
			`You already have ${JOBS_PER_OWNER} imports or printed sheets in progress; start this one when one of them is done. Nothing was written.`,
			{ code: 'too-many-jobs' }
		);
	inFlight.set(owner, mine + 1);
	try {
		return await runOwnedJob<T>(task, what);
	} finally {
		const left = (inFlight.get(owner) ?? 1) - 1;
		if (left > 0) inFlight.set(owner, left);
		else inFlight.delete(owner);
	}
}

async function runOwnedJob<T>(task: Task, what: string): Promise<T> {
	let result: unknown;
	try {
		result = await thePool().run(task, { signal: AbortSignal.timeout(JOB_TIME_MS) });
	} catch (err) {
		const e = err as { name?: string; code?: string; message?: string };
		if (e.name === 'AbortError' || e.name === 'TimeoutError')
			throw new JobRefusedError(
				422,
				`${what} took longer than ${JOB_TIME_MS / 1000} s and was stopped; nothing was written.`,
				{ code: 'too-slow' }
			);
		if (/queue is at limit/i.test(e.message ?? ''))
			throw new JobRefusedError(
				503,
				'The server is busy with other imports and printed sheets; try again in a minute. Nothing was written.',
				{ code: 'busy' }
			);
		if (e.code === 'ERR_WORKER_OUT_OF_MEMORY' || /out of memory/i.test(e.message ?? ''))
			throw new JobRefusedError(
				413,
				`${what} needs more than ${JOB_HEAP_MB} MB of memory and was stopped; nothing was written.`,
				{ code: 'too-large' }
			);
		throw err;
	}
	if (isRefusal(result)) {
		const { code, issues, ...extra } = result.refused.extra ?? {};
		throw new JobRefusedError(result.refused.status, result.refused.message, {
			code: typeof code === 'string' ? code : undefined,
			issues: Array.isArray(issues) ? (issues as Issue[]) : undefined,
			extra
		});
	}
	return result as T;
}

export async function closePool(): Promise<void> {
	await pool?.destroy();
	pool = undefined;
}
