/**
 * Moves of many elements to a material's new revision run in the background on a PostgreSQL-backed queue
 * (pg-boss), so a restart loses nothing: the move's row keeps its progress and the outcome of each element
 * done, and the next run continues there. One queued and one running job per move at most (the queue's
 * "stately" policy, keyed by the move). A run that stops without finishing leaves no heartbeat; a worker
 * looks for such moves at start-up and every few seconds and queues them again.
 *
 * It registers itself with the other workers when imported (`hooks.server.ts` imports it at start-up, as
 * it does the audit worker, so stalled moves are queued again after a restart). `workers.ts` cannot import
 * it: this file reaches the element service, which reaches the outbox, which imports `workers.ts`. Queueing
 * a move, or looking at a material whose move waits, also starts this process's worker when it is not
 * running yet (a test, ENVELO_NO_WORKERS=1, or a process that loaded this file only on a request), so a
 * move asked for is never left waiting for a worker that never comes.
 */
import PgBoss from 'pg-boss';
import { db } from '$lib/server/db';
import { setting } from '$lib/server/config';
import { registerWorker } from '$lib/server/workers';
import { runMove, stalledMoves } from './reach-move';
import { pruneOutcomes } from './reach-compute';

export const REACH_QUEUE = 'library-reach-move';
const SCHEMA = 'pgboss';

/** How often a worker looks for stalled moves. */
export const RECOVER_EVERY_MS = 15_000;

const QUEUE: PgBoss.Queue = {
	name: REACH_QUEUE,
	policy: 'stately',
	// an error (not a dead worker) tries again; the move continues after its last saved element
	retryLimit: 3,
	retryDelay: 5,
	expireInSeconds: 6 * 60 * 60
};

type JobData = { organisationId: string; moveId: string };

// One client per process, like the one Knex instance: a connection pool, not user state.
const local = {
	boss: null as PgBoss | null,
	starting: null as Promise<PgBoss> | null,
	working: null as Promise<void> | null,
	stopped: false,
	timer: null as ReturnType<typeof setInterval> | null,
	abort: new AbortController(),
	runs: new Set<Promise<unknown>>()
};

async function client(): Promise<PgBoss> {
	if (local.stopped) throw new Error('the server is shutting down');
	if (local.boss) return local.boss;
	local.starting ??= (async () => {
		const url = setting('DATABASE_URL');
		if (!url) throw new Error('DATABASE_URL is not set');
		const b = new PgBoss({ connectionString: url, max: 2, schema: SCHEMA });
		b.on('error', (e) => console.error('[envelo] library reach queue:', e));
		await b.start();
		await b.createQueue(REACH_QUEUE, QUEUE);
		await b.updateQueue(REACH_QUEUE, QUEUE);
		local.boss = b;
		return b;
	})();
	try {
		return await local.starting;
	} catch (e) {
		local.starting = null;
		throw e;
	}
}

/** Run one move in this process, tracked so that shutdown can stop it between chunks. */
function run(moveId: string): Promise<boolean> {
	const p = runMove(moveId, { signal: local.abort.signal });
	local.runs.add(p);
	const untrack = () => local.runs.delete(p);
	p.then(untrack, untrack);
	return p;
}

/**
 * Queue a move. When the queue cannot be reached the move runs in this process instead, so asking for a
 * move never silently does nothing.
 */
export async function enqueueMove(organisationId: string, moveId: string): Promise<void> {
	try {
		await startReachWorker();
		const b = await client();
		await b.send(REACH_QUEUE, { organisationId, moveId } satisfies JobData, {
			singletonKey: moveId,
			expireInSeconds: QUEUE.expireInSeconds
		});
	} catch (e) {
		console.error('[envelo] library reach queue unavailable, moving in-process:', e);
		void run(moveId).catch((err) => console.error('[envelo] library reach move failed:', err));
	}
}

/** Queue again every move that is waiting without a job or whose run stalled; how many. */
export async function recoverStalledMoves(): Promise<number> {
	const b = await client();
	let n = 0;
	for (const m of await stalledMoves()) {
		if (local.stopped) break;
		const id = await b.send(
			REACH_QUEUE,
			{ organisationId: m.organisationId, moveId: m.id } satisfies JobData,
			{
				singletonKey: m.id,
				expireInSeconds: QUEUE.expireInSeconds
			}
		);
		if (id) n++;
	}
	return n;
}

async function recoverQuietly() {
	try {
		const n = await recoverStalledMoves();
		if (n) console.log(`[envelo] library reach: ${n} stalled move(s) queued again`);
	} catch (e) {
		console.error('[envelo] library reach: looking for stalled moves failed:', e);
	}
}

/** Work the queue in this process (once), and look for stalled moves now and every RECOVER_EVERY_MS. */
export function startReachWorker(): Promise<void> {
	local.working ??= (async () => {
		const b = await client();
		await b.work<JobData>(REACH_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async (jobs) => {
			for (const job of jobs) await run(job.data.moveId);
		});
		await pruneOutcomes(db).catch((e) => console.error('[envelo] library reach: pruning outcomes:', e));
		void recoverQuietly();
		if (local.stopped) return;
		local.timer ??= setInterval(() => void recoverQuietly(), RECOVER_EVERY_MS);
		local.timer.unref?.();
	})().catch((e) => {
		local.working = null;
		throw e;
	});
	return local.working;
}

/** On shutdown: stop looking, stop this process's runs between chunks, stop polling, close the pool. */
export async function stopReachWorker() {
	local.stopped = true;
	if (local.timer) clearInterval(local.timer);
	local.timer = null;
	local.abort.abort();
	await Promise.allSettled([...local.runs]);
	const b = local.boss ?? (local.starting ? await local.starting.catch(() => null) : null);
	local.boss = null;
	local.starting = null;
	local.working = null;
	if (b) await b.stop({ graceful: false, wait: true, close: true });
}

registerWorker(REACH_QUEUE, startReachWorker, stopReachWorker);
