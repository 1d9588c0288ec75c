import { describe, it, expect, afterAll } from 'vitest';
import PgBoss from 'pg-boss';
import { hasDatabase, makeTeam, fakeEvent, tdb, asMember, callHandler } from '../../factories';
import { isStalled } from '../../../src/lib/audit/rules';

// A batch recompute whose worker stops half-way (the process is killed) is taken over and finished:
// the rule "running, but no heartbeat for 30 s = stalled", the continuation at the batch's `done` and
// the counts are the product's own rules (common practice, no source: a lease renewed by a heartbeat).

const sleep = (ms: number) => new Promise((r) => setTimeout(r, ms));

describe.skipIf(!hasDatabase)('a recompute interrupted half-way (PostgreSQL)', async () => {
	const audits = await import('../../../src/lib/server/audit');
	const recompute = await import('../../../src/lib/server/audit/recompute');
	const worker = await import('../../../src/lib/server/audit/worker');
	const { db } = await import('../../../src/lib/server/db');
	const f = await import('../../factories-audit');
	const batchPage = await import('../../../src/routes/(app)/audit/[batchId=uuid]/+page.server');
	const refreshApi = await import('../../../src/routes/api/v1/audit/batches/[batchId=uuid]/refresh/+server');

	afterAll(async () => {
		await worker.stopAuditWorker?.();
		const { authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const DWELLINGS = 6;

	/** A batch of six dwellings, all in the sample; every third one has no issued report (a flag). */
	async function batch() {
		const t = await makeTeam();
		const climateId = await f.makeClimate(t.org.id);
		await f.makeLimitTable(t.org.id, { 'external-wall': 0.3 });
		const layers = await f.cleanWallLayers(t.org.id);
		const references: string[] = [];
		for (let i = 0; i < DWELLINGS; i++) {
			const d = await f.makeDwelling(t.org.id, t.assessor.id, { climateId });
			await f.makeElement(t.org.id, d.id, { layers });
			if (i % 3 !== 2) await f.issueReport(t.org.id, d.id, t.assessor.id);
			references.push(d.reference);
		}
		const b = await audits.createBatch(asMember(t.supervisor), {
			name: `Resume ${t.org.id.slice(0, 6)}`,
			source: 'references',
			filter: {},
			references,
			sampling: { rule: 'all', includeFlagged: false }
		});
		return { ...t, batchId: b.id };
	}

	const progressOf = async (batchId: string) =>
		(await tdb()('audit_batches').where({ id: batchId }).first('progress')).progress;

	const setProgress = (batchId: string, patch: Record<string, unknown>) =>
		tdb()('audit_batches')
			.where({ id: batchId })
			.update({ progress: tdb().raw(`progress || ?::jsonb`, [JSON.stringify(patch)]) });

	/**
	 * The batch as a worker killed half-way leaves it: the items of the first two dwellings of the
	 * population recomputed (and logged) with the chunk that counted them, the batch still running at 2 of
	 * 6, its last heartbeat 90 s ago.
	 */
	async function deadWorker(orgId: string, batchId: string) {
		const row = await tdb()('audit_batches').where({ id: batchId }).first('filter', 'progress');
		const first = (row.filter.population as string[]).slice(0, 2);
		for (const dwellingId of first) await audits.recomputeItem(orgId, batchId, dwellingId, null);
		const flags = await tdb()('audit_items')
			.where({ batch_id: batchId })
			.whereIn('dwelling_id', first)
			.select('flags');
		const beat = new Date(Date.now() - 90_000).toISOString();
		await setProgress(batchId, {
			state: 'running',
			done: 2,
			total: DWELLINGS,
			flagged: flags.filter((f) => f.flags.length > 0).length,
			added: 0,
			startedAt: beat,
			heartbeat: beat
		});
		return recomputedAt(batchId);
	}

	/** dwelling id → when its item was last recomputed */
	async function recomputedAt(batchId: string) {
		const rows = await tdb()('audit_items')
			.where({ batch_id: batchId })
			.select('dwelling_id', 'recomputed_at');
		return new Map(rows.map((r) => [r.dwelling_id as string, r.recomputed_at as Date | null]));
	}

	/** Each item of the batch recomputed exactly once, the batch done with counts that add up. */
	async function expectFinishedOnce(orgId: string, batchId: string, before: Map<string, Date | null>) {
		const p = await progressOf(batchId);
		expect(p).toMatchObject({ state: 'done', done: DWELLINGS, total: DWELLINGS });
		const items = await tdb()('audit_items')
			.where({ batch_id: batchId })
			.select('id', 'dwelling_id', 'flags');
		expect(items).toHaveLength(DWELLINGS);
		const logged = await tdb()('activity_log')
			.where({ organisation_id: orgId, action: 'audit-recompute' })
			.whereIn(
				'entity_id',
				items.map((i) => i.id)
			)
			.select('entity_id');
		const perItem = new Map<string, number>();
		for (const l of logged) perItem.set(l.entity_id, (perItem.get(l.entity_id) ?? 0) + 1);
		expect(items.map((i) => perItem.get(i.id) ?? 0)).toEqual(items.map(() => 1));
		// the two recomputed before the stop were not touched again
		const after = await recomputedAt(batchId);
		const early = [...before].filter(([, at]) => at !== null);
		expect(early).toHaveLength(2);
		for (const [dwellingId, at] of early) expect(after.get(dwellingId)).toEqual(at);
		// every third dwelling is not issued: 2 of 6 carry a flag, counted once
		expect(items.filter((i) => i.flags.length > 0)).toHaveLength(2);
		expect(p.flagged).toBe(2);
		const summary = await tdb()('activity_log')
			.where({ organisation_id: orgId, action: 'audit-batch-recompute', entity_id: batchId })
			.select('details');
		expect(summary.map((s) => s.details)).toEqual([
			{ dwellings: DWELLINGS, flagged: 2, added: 0, partial: false, continuedFrom: 2 }
		]);
	}

	const refreshByPage = (member: Parameters<typeof fakeEvent>[0], batchId: string) =>
		(batchPage.actions.refresh as (e: unknown) => Promise<unknown>)({
			...fakeEvent(member, `/audit/${batchId}`),
			params: { batchId }
		});
	const refreshByApi = (member: Parameters<typeof callHandler>[1], batchId: string) =>
		callHandler(refreshApi.POST, member, 'POST', `/api/v1/audit/batches/${batchId}/refresh`, {
			params: { batchId }
		});

	it('"Recompute again" and the API refresh take a stalled batch over instead of answering 409', async () => {
		const t = await batch();
		const before = await deadWorker(t.org.id, t.batchId);

		expect(await refreshByPage(t.supervisor, t.batchId)).toEqual({ done: 'The recompute is queued.' });
		expect(await refreshByApi(t.supervisor, t.batchId)).toMatchObject({
			status: 202,
			json: { state: 'queued' }
		});
		// one job waits for the batch (the second request joined the first one's job)
		const jobs = await tdb()
			.withSchema('pgboss')
			.from('job')
			.where({ name: worker.AUDIT_QUEUE, singleton_key: t.batchId })
			.select('state', 'data');
		expect(jobs.map((j) => [j.state, j.data.request])).toEqual([['created', 1]]);
		// the stalled run is disowned; the batch stays at 2 of 6 until a run takes it over
		expect(await progressOf(t.batchId)).toMatchObject({
			state: 'running',
			done: 2,
			runId: null,
			requested: 2
		});

		// what the worker does with that job: it continues at 2 and finishes, answering both requests
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId, { request: 1 })).toBe(true);
		await expectFinishedOnce(t.org.id, t.batchId, before);
		expect(await progressOf(t.batchId)).toMatchObject({ served: 2 });
		// the same job again (a retry, or one queued twice) finds its request served and recomputes nothing
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId, { request: 1 })).toBe(false);
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId, { request: 2 })).toBe(false);
		await expectFinishedOnce(t.org.id, t.batchId, before);
	});

	it('a live recompute keeps its heartbeat and is still refused with 409', async () => {
		const t = await batch();
		let release!: () => void;
		const held = new Promise<void>((r) => (release = r));
		let paused!: () => void;
		const atPause = new Promise<void>((r) => (paused = r));
		const run = recompute.recomputeBatchWith(db, t.org.id, t.batchId, {
			chunkSize: 2,
			heartbeatMs: 20,
			onChunk: async ({ done }) => {
				if (done === 2) {
					paused();
					await held;
				}
			}
		});
		await atPause;
		const first = (await progressOf(t.batchId)).heartbeat;
		let beat = first;
		for (let k = 0; k < 500 && beat === first; k++) {
			await sleep(10);
			beat = (await progressOf(t.batchId)).heartbeat;
		}
		expect(Date.parse(beat)).toBeGreaterThan(Date.parse(first));
		expect(isStalled(await progressOf(t.batchId))).toBe(false);

		const refused = await refreshByPage(t.supervisor, t.batchId);
		expect(refused).toMatchObject({
			status: 409,
			data: { error: 'A recompute of this batch is already running.' }
		});
		expect(await refreshByApi(t.supervisor, t.batchId)).toMatchObject({
			status: 202,
			json: { state: 'running' }
		});
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId)).toBe(false);
		expect(await progressOf(t.batchId)).toMatchObject({ state: 'running', done: 2 });
		release();
		expect(await run).toBe(true);
		expect(await progressOf(t.batchId)).toMatchObject({ state: 'done', done: DWELLINGS, flagged: 2 });
	});

	it('a run that was taken over while it hung writes nothing more', async () => {
		const t = await batch();
		let release!: () => void;
		const held = new Promise<void>((r) => (release = r));
		let paused!: () => void;
		const atPause = new Promise<void>((r) => (paused = r));
		const hung = recompute.recomputeBatchWith(db, t.org.id, t.batchId, {
			chunkSize: 2,
			heartbeatMs: 3_600_000, // it writes no heartbeat while it hangs
			onChunk: async ({ done }) => {
				if (done === 2) {
					paused();
					await held;
				}
			}
		});
		await atPause;
		const before = await recomputedAt(t.batchId);
		await setProgress(t.batchId, { heartbeat: new Date(Date.now() - 90_000).toISOString() });
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId)).toBe(true);
		release();
		// it wakes, computes its next chunk, finds the batch held by another run and rolls the chunk back
		expect(await hung).toBe(false);
		await expectFinishedOnce(t.org.id, t.batchId, before);
	});

	it('a run stopped on shutdown leaves its batch with no heartbeat, and the next run continues it', async () => {
		const t = await batch();
		const stop = new AbortController();
		const ran = await recompute.recomputeBatchWith(db, t.org.id, t.batchId, {
			chunkSize: 2,
			signal: stop.signal,
			onChunk: ({ done }) => {
				if (done >= 2) stop.abort();
			}
		});
		expect(ran).toBe(false);
		const left = await progressOf(t.batchId);
		expect(left).toMatchObject({ state: 'running', done: 2, total: DWELLINGS, heartbeat: null });
		expect(isStalled(left)).toBe(true);
		const before = await recomputedAt(t.batchId);
		expect(await refreshByPage(t.supervisor, t.batchId)).toEqual({ done: 'The recompute is queued.' });
		expect(await recompute.recomputeBatchWith(db, t.org.id, t.batchId, { request: 1 })).toBe(true);
		await expectFinishedOnce(t.org.id, t.batchId, before);
	});

	it('a worker at start-up, and then periodically, queues stalled batches again and finishes them', async () => {
		const t = await batch();
		// the job of the killed worker stays "active" in the queue: fetched, never completed
		const request = await recompute.requestRecomputeWith(db, t.org.id, t.batchId);
		expect(request).toBe(1);
		const url = process.env.TEST_DATABASE_URL!;
		const killed = new PgBoss({
			connectionString: url,
			schema: 'pgboss',
			max: 1,
			supervise: false,
			schedule: false
		});
		await killed.start();
		await killed.createQueue(worker.AUDIT_QUEUE, { name: worker.AUDIT_QUEUE, policy: 'stately' });
		const deadId = await killed.send(
			worker.AUDIT_QUEUE,
			{ organisationId: t.org.id, batchId: t.batchId, userId: null, request },
			{ singletonKey: t.batchId, priority: 10 }
		);
		const [fetched] = await killed.fetch(worker.AUDIT_QUEUE);
		expect(fetched.id).toBe(deadId);
		await killed.stop({ graceful: false, close: true });
		const before = await deadWorker(t.org.id, t.batchId);

		await worker.startAuditWorker();
		const waitDone = async (batchId: string) => {
			for (let k = 0; k < 200 && (await progressOf(batchId)).state !== 'done'; k++) await sleep(100);
		};
		await waitDone(t.batchId);
		await expectFinishedOnce(t.org.id, t.batchId, before);
		const dead = await tdb().withSchema('pgboss').from('job').where({ id: deadId }).first('state');
		expect(dead.state).toBe('cancelled');

		// a batch that stalls while the worker runs is found by the next look
		const u = await batch();
		const beforeU = await deadWorker(u.org.id, u.batchId);
		expect(await worker.recoverStalled()).toBeGreaterThanOrEqual(1);
		await waitDone(u.batchId);
		await expectFinishedOnce(u.org.id, u.batchId, beforeU);
	}, 60_000);
});
