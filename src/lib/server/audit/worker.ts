/**
 * The audit recompute runs in the background on a PostgreSQL-backed queue (pg-boss), so a restart of
 * the server loses nothing: a job that was running when the process stopped expires and is retried.
 * One queued and one running job per batch at most (the queue's "stately" policy, keyed by batch).
 */
import PgBoss from 'pg-boss';
import { registerWorker } from '$lib/server/workers';
import { setting } from '$lib/server/config';
import { markQueued, recomputeBatch } from '$lib/server/audit';

export const AUDIT_QUEUE = 'audit-recompute';

type JobData = { organisationId: string; batchId: string; userId: string | null };

// One client per process, like the one Knex instance: a connection pool, not user state.
let boss: PgBoss | null = null;
let starting: Promise<PgBoss> | null = null;

// Set once the process shuts down: no new client is started after that.
let stopped = false;

async function client(): Promise<PgBoss> {
	if (stopped) throw new Error('the server is shutting down');
	if (boss) return boss;
	starting ??= (async () => {
		const url = setting('DATABASE_URL');
		if (!url) throw new Error('DATABASE_URL is not set');
		const b = new PgBoss({ connectionString: url, max: 3, schema: 'pgboss' });
		b.on('error', (e) => console.error('[envelo] audit queue:', e));
		await b.start();
		await b.createQueue(AUDIT_QUEUE, {
			name: AUDIT_QUEUE,
			policy: 'stately',
			retryLimit: 2,
			retryDelay: 5,
			expireInSeconds: 15 * 60
		});
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

/**
 * Queue a recompute of the batch. When the queue cannot be reached the recompute runs in this process
 * instead (it is idempotent), so opening a batch never silently does nothing.
 */
export async function enqueueRecompute(
	organisationId: string,
	batchId: string,
	userId: string | null
): Promise<'queued' | 'running'> {
	const fresh = await markQueued(organisationId, batchId);
	if (!fresh) return 'running';
	try {
		const b = await client();
		await b.send(AUDIT_QUEUE, { organisationId, batchId, userId } satisfies JobData, {
			singletonKey: batchId
		});
	} catch (e) {
		console.error('[envelo] audit queue unavailable, recomputing in-process:', e);
		void recomputeBatch(organisationId, batchId, { userId }).catch((err) =>
			console.error('[envelo] audit recompute failed:', err)
		);
	}
	return 'queued';
}

async function start() {
	const b = await client();
	await b.work<JobData>(AUDIT_QUEUE, { batchSize: 1, pollingIntervalSeconds: 1 }, async (jobs) => {
		for (const job of jobs) {
			await recomputeBatch(job.data.organisationId, job.data.batchId, { userId: job.data.userId });
		}
	});
}

/**
 * On shutdown: stop polling and maintenance and close the queue's pool at once. A job still running is
 * marked failed and retried by the next process (the recompute is idempotent).
 */
async function stop() {
	stopped = true;
	const b = boss ?? (starting ? await starting.catch(() => null) : null);
	boss = null;
	starting = null;
	if (b) await b.stop({ graceful: false, wait: true, close: true });
}

registerWorker(AUDIT_QUEUE, start, stop);
