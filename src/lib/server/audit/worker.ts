/**
 * The audit recompute runs in the background on a PostgreSQL-backed queue (pg-boss), so a restart of
 * the server loses nothing. One queued and one running job per batch at most (the queue's "stately"
 * policy, keyed by batch).
 *
 * A job only starts a run; whether a run is alive is told by the heartbeat it writes on the batch
 * (`recompute.ts`). A batch still running whose heartbeat is older than half a minute has lost its worker:
 * "Recompute again" takes it over, and every worker looks for such batches at start-up and every few
 * seconds and queues them again; the new run continues where the stalled one stopped. So the job's
 * expiry is only a backstop far beyond any real run, not the way a dead run is noticed.
 */
import PgBoss from 'pg-boss';
import { db } from '$lib/server/db';
import { registerWorker } from '$lib/server/workers';
import { setting } from '$lib/server/config';
import { recomputeBatchWith, requestRecomputeWith, stalledBatchesWith } from './recompute';

export const AUDIT_QUEUE = 'audit-recompute';
const SCHEMA = 'pgboss';

/** How often a worker looks for stalled batches (a batch is stalled half a minute after its last heartbeat). */
export const RECOVER_EVERY_MS = 5_000;

const QUEUE: PgBoss.Queue = {
	name: AUDIT_QUEUE,
	policy: 'stately',
	// a run that failed (an error, not a dead worker) is tried again from its first dwelling
	retryLimit: 2,
	retryDelay: 5,
	// far beyond any real run: a live run is never expired (and retried beside itself), a dead one is
	// found by its heartbeat long before
	expireInSeconds: 6 * 60 * 60
};

type JobData = { organisationId: string; batchId: string; userId: string | null; request?: number };

// One client per process, like the one Knex instance: a connection pool, not user state.
let boss: PgBoss | null = null;
let starting: Promise<PgBoss> | null = null;

// Set once the process shuts down: no new client is started after that.
let stopped = false;
// Process state of the worker: the recovery timer, the signal that stops this process's runs on
// shutdown, and the runs in flight (awaited briefly on shutdown so they leave their batch cleanly).
const local = {
	timer: null as ReturnType<typeof setInterval> | null,
	abort: new AbortController(),
	runs: new Set<Promise<unknown>>()
};

async function client(): Promise<PgBoss> {
	if (stopped) throw new Error('the server is shutting down');
	if (boss) return boss;
	starting ??= (async () => {
		const url = setting('DATABASE_URL');
		if (!url) throw new Error('DATABASE_URL is not set');
		const b = new PgBoss({ connectionString: url, max: 3, schema: SCHEMA });
		b.on('error', (e) => console.error('[envelo] audit queue:', e));
		await b.start();
		await b.createQueue(AUDIT_QUEUE, QUEUE);
		// createQueue leaves an existing queue as it was; its options follow this file
		await b.updateQueue(AUDIT_QUEUE, QUEUE);
		boss = b;
		return b;
	})();
	try {
		return await starting;
	} catch (e) {
		starting = null;
		throw e;
	}
}

/** Run one recompute in this process, tracked so that shutdown can stop it between chunks. */
function run(data: JobData): Promise<boolean> {
	const p = recomputeBatchWith(db, data.organisationId, data.batchId, {
		userId: data.userId,
		request: data.request,
		signal: local.abort.signal
	});
	local.runs.add(p);
	const untrack = () => local.runs.delete(p);
	p.then(untrack, untrack);
	return p;
}

/**
 * Jobs of the batch still marked active in the queue. Called only once the batch is known not to be
 * held by a live run, so these belong to a worker that died: while one stays active, a new job of the
 * same batch cannot start (the stately policy), and, being first in line, would hold up the queue.
 */
async function cancelDeadJobs(b: PgBoss, batchId: string) {
	const { rows } = await b
		.getDb()
		.executeSql(`SELECT id FROM ${SCHEMA}.job WHERE name = $1 AND singleton_key = $2 AND state = 'active'`, [
			AUDIT_QUEUE,
			batchId
		]);
	if (rows.length)
		await b.cancel(
			AUDIT_QUEUE,
			rows.map((r: { id: string }) => r.id)
		);
}

/**
 * Queue a recompute of the batch: 'running' (nothing queued) while a live run holds it; a stalled
 * batch is taken over. When the queue cannot be reached the recompute runs in this process instead, so
 * opening a batch never silently does nothing.
 */
export async function enqueueRecompute(
	organisationId: string,
	batchId: string,
	userId: string | null
): Promise<'queued' | 'running'> {
	const request = await requestRecomputeWith(db, organisationId, batchId);
	if (request === null) return 'running';
	const data: JobData = { organisationId, batchId, userId, request };
	try {
		const b = await client();
		await cancelDeadJobs(b, batchId);
		await b.send(AUDIT_QUEUE, data, { singletonKey: batchId, expireInSeconds: QUEUE.expireInSeconds });
	} catch (e) {
		console.error('[envelo] audit queue unavailable, recomputing in-process:', e);
		void run(data).catch((err) => console.error('[envelo] audit recompute failed:', err));
	}
	return 'queued';
}

/** Queue again every batch whose recompute has stalled; how many. */
export async function recoverStalled(): Promise<number> {
	let n = 0;
	for (const s of await stalledBatchesWith(db)) {
		if (stopped) break;
		if ((await enqueueRecompute(s.organisationId, s.batchId, null)) === 'queued') n++;
	}
	return n;
}

async function recoverQuietly() {
	try {
		const n = await recoverStalled();
		if (n) console.log(`[envelo] audit: ${n} stalled recompute(s) queued again`);
	} catch (e) {
		console.error('[envelo] audit: looking for stalled recomputes failed:', e);
	}
}

/** Work the queue in this process, and look for stalled batches now and every RECOVER_EVERY_MS. */
export async function startAuditWorker() {
	const b = await client();
	await b.work<JobData>(AUDIT_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async (jobs) => {
		for (const job of jobs) await run(job.data);
	});
	await recoverQuietly();
	if (stopped) return;
	local.timer ??= setInterval(() => void recoverQuietly(), RECOVER_EVERY_MS);
	local.timer.unref?.();
}

/**
 * On shutdown: stop looking for stalled batches, stop this process's runs between chunks (each leaves
 * its batch with no heartbeat, so the next worker continues it at once), then stop polling and close
 * the queue's pool. A batch whose run could not leave it cleanly is taken over half a minute later.
 */
export async function stopAuditWorker() {
	stopped = true;
	if (local.timer) clearInterval(local.timer);
	local.timer = null;
	local.abort.abort();
	await Promise.allSettled([...local.runs]);
	const b = boss ?? (starting ? await starting.catch(() => null) : null);
	boss = null;
	starting = null;
	if (b) await b.stop({ graceful: false, wait: true, close: true });
}

registerWorker(AUDIT_QUEUE, startAuditWorker, stopAuditWorker);
