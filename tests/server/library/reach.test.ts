import { describe, it, expect, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { hasDatabase, makeTeam, tdb, asMember, callHandler } from '../../factories';
import { boardValues } from '../../factories-library';
import { makeLimitTable } from '../../factories-dwellings';
import { issueReport, makeDwelling } from '../../factories-audit';

// The reach of a library correction against a real PostgreSQL: which elements use an older revision of a
// material, what the current revision would change, and the move of a chosen set of them to it.
//
// The U-values are checked against the ISO 6946 sum computed here by hand, independently of the engine:
// U = 1 / (Rsi + Σ d/λ + Rse) with Rsi = 0.13 and Rse = 0.04 m²·K/W for horizontal heat flow
// (ISO 6946:2017, 6.8, Table 7), the layers homogeneous (6.7.1: R = d/λ), no corrections (no air gaps
// nor fasteners). The limit of 0.30 W/(m²·K) is invented for the test; which revision, skip and log
// rules apply is the product's own workflow (common practice, no source).

const RSI = 0.13; // ISO 6946:2017, Table 7, horizontal heat flow
const RSE = 0.04; // ISO 6946:2017, Table 7
/** Plasterboard 12.5 mm λ 0.25, insulation 100 mm, brick 100 mm λ 0.5 (generic values, common practice, no source). */
const handU = (lambdaInsulation: number) =>
	1 / (RSI + 0.0125 / 0.25 + 0.1 / lambdaInsulation + 0.1 / 0.5 + RSE);

describe.skipIf(!hasDatabase)('the reach of a library correction', async () => {
	const lib = await import('../../../src/lib/server/library');
	const reach = await import('../../../src/lib/server/library/reach');
	const move = await import('../../../src/lib/server/library/reach-move');
	const worker = await import('../../../src/lib/server/library/reach-worker');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const reachApi = await import('../../../src/routes/api/v1/materials/[materialId=uuid]/reach/+server');
	const moveApi = await import('../../../src/routes/api/v1/materials/[materialId=uuid]/reach/move/+server');
	const progressApi =
		await import('../../../src/routes/api/v1/materials/[materialId=uuid]/reach/move/[moveId=uuid]/+server');

	afterAll(async () => {
		await worker.stopReachWorker();
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	type Team = Awaited<ReturnType<typeof makeTeam>>;
	const actor = (m: { id: string; organisationId: string }) => ({
		userId: m.id,
		organisationId: m.organisationId
	});

	/** A team with a limit of 0.30 for walls and an insulation board at λ 0.033 (revision 1). */
	async function setup() {
		const t = await makeTeam();
		await makeLimitTable(t.org.id, { 'external-wall': 0.3 });
		const values = boardValues({ lambda: 0.033, muDry: 1 });
		const board = await lib.createMaterial(actor(t.assessor), values);
		return { ...t, board, values };
	}

	const wallLayers = (board: { id: string; revisionId: string; code: string; lambda: number | null }) => [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
		{
			name: 'Insulation',
			thicknessMm: 100,
			lambda: board.lambda!,
			mu: 1,
			materialId: board.id,
			materialRevisionId: board.revisionId,
			materialCode: board.code
		},
		{ name: 'Brick', thicknessMm: 100, lambda: 0.5, mu: 10 }
	];

	/** A wall of the board in a new dwelling, saved through the element service (so its result is stored). */
	async function wall(t: Team, board: Parameters<typeof wallLayers>[0], opts: { status?: string } = {}) {
		const d = await makeDwelling(t.org.id, t.assessor.id);
		const el = await elements.createElement(asMember(t.assessor), d.id, {
			name: 'Wall',
			kind: 'external-wall',
			area: 20,
			buildUp: { layers: wallLayers(board) },
			internal: { temperature: 20, humidityClass: 3 }
		});
		if (opts.status) await tdb()('dwellings').where({ id: d.id }).update({ status: opts.status });
		return { dwellingId: d.id, reference: d.reference, elementId: el.id };
	}

	/** Revision 2 of the board: λ corrected from 0.033 to 0.040. */
	async function correct(t: Team & { values: object }, materialId: string, lambda = 0.04) {
		const r = await lib.updateMaterial(actor(t.admin), materialId, { ...t.values, lambda });
		expect(r.outcome).toBe('changed');
		return r.material;
	}

	it('finds the elements on an older revision, not those on the current one, never another organisation’s', async () => {
		const t = await setup();
		const old = await wall(t, t.board);
		const rev2 = await correct(t, t.board.id);
		const onCurrent = await wall(t, { ...t.board, revisionId: rev2.revisionId, lambda: rev2.lambda });
		// another organisation's element that names this material (written past the service, which refuses
		// it) stays out of the reach, and the other organisation does not see the material at all
		const other = await makeTeam();
		const od = await makeDwelling(other.org.id, other.assessor.id);
		await tdb()('elements').insert({
			organisation_id: other.org.id,
			dwelling_id: od.id,
			name: 'Foreign wall',
			kind: 'external-wall',
			area: 10,
			heat_flow: 'horizontal',
			build_up: JSON.stringify({ layers: wallLayers(t.board) })
		});

		const r = (await reach.getReach(t.org.id, t.board.id))!;
		expect(r.to).toMatchObject({ id: rev2.revisionId, revision: 2 });
		expect(r.olderRevisions).toEqual([1]);
		const ids = r.dwellings.flatMap((d) => d.elements.map((e) => e.id));
		expect(ids).toEqual([old.elementId]);
		expect(ids).not.toContain(onCurrent.elementId);
		expect(r.dwellings[0]).toMatchObject({ id: old.dwellingId, reference: old.reference, issuedReports: 0 });
		expect(r.dwellings[0].elements[0].layers).toEqual([
			{ layerIndex: 1, fromRevisionId: t.board.revisionId, fromRevision: 1 }
		]);
		expect(await reach.getReach(other.org.id, t.board.id)).toBeNull();
		// the API answers another organisation's material with 404, without echoing the id
		const res = await callHandler(
			reachApi.GET,
			other.assessor,
			'GET',
			`/api/v1/materials/${t.board.id}/reach`,
			{
				params: { materialId: t.board.id }
			}
		);
		expect(res.status).toBe(404);
		expect(res.text).not.toContain(t.board.id);
	});

	it('gives the U now and with the new revision (ISO 6946 by hand) and sees the pass turn into a fail', async () => {
		const t = await setup();
		const w = await wall(t, t.board);
		await correct(t, t.board.id, 0.04);
		const r = (await reach.getReach(t.org.id, t.board.id))!;
		const e = r.dwellings[0].elements[0];
		// by hand: λ 0.033 gives RT = 3.4503 m²·K/W, U = 0.2898; λ 0.040 gives RT = 2.92, U = 0.3425
		expect(e.now.u).toBeCloseTo(handU(0.033), 3);
		expect(e.next!.u).toBeCloseTo(handU(0.04), 3);
		expect(e.limit).toBe(0.3);
		expect([e.now.pass, e.next!.pass, e.passFlip]).toEqual([true, false, 'to-fail']);
		expect(r.totals).toMatchObject({ elements: 1, dwellings: 1, flips: 1, toFail: 1, toPass: 0 });
		// no climate: no moisture check before or after, so no change of it
		expect([e.now.moisture, e.next!.moisture, e.moistureChanged]).toEqual([null, null, false]);
		// a second look reads the kept outcome and says the same
		const again = (await reach.getReach(t.org.id, t.board.id))!;
		expect(again.dwellings[0].elements[0].next).toEqual(e.next);
		// and it is what the element service stores once the element is moved
		await reach.startMove(asMember(t.assessor), t.board.id, {
			elementIds: [w.elementId],
			toRevisionId: r.to.id
		});
		const saved = (await elements.getElement(t.org.id, w.elementId))!;
		expect(saved.lastResult!.uValue).toBeCloseTo(e.next!.u!, 12);
		expect(saved.lastResult!.condensation?.outcome ?? null).toBe(e.next!.moisture);
	});

	it('marks dwellings with issued reports and those to reopen first, and counts them', async () => {
		const t = await setup();
		const issued = await wall(t, t.board);
		await issueReport(t.org.id, issued.dwellingId, t.assessor.id);
		const accepted = await wall(t, t.board, { status: 'accepted' });
		await correct(t, t.board.id);
		const r = (await reach.getReach(t.org.id, t.board.id))!;
		const by = new Map(r.dwellings.map((d) => [d.id, d]));
		expect(by.get(issued.dwellingId)).toMatchObject({
			issuedReports: 1,
			status: 'issued',
			needsReopening: false
		});
		expect(by.get(accepted.dwellingId)).toMatchObject({ status: 'accepted', needsReopening: true });
		expect(r.totals).toMatchObject({ dwellings: 2, withIssuedReports: 1, needsReopening: 1, accepted: 1 });
	});

	it('names each dwelling’s latest audit item: one waiting for a decision, one decided', async () => {
		const t = await setup();
		const waiting = await wall(t, t.board);
		const decided = await wall(t, t.board);
		const never = await wall(t, t.board);
		await correct(t, t.board.id);
		// batches and items written past the audit service (which samples and recomputes): only the rows
		// the reach reads matter here
		const batch = async (name: string, status = 'open') => {
			const [b] = await tdb()('audit_batches')
				.insert({
					organisation_id: t.org.id,
					name,
					sampling: JSON.stringify({ rule: 'all', includeFlagged: false }),
					seed: 'seed',
					status,
					created_by: t.supervisor.id
				})
				.returning('id');
			return b.id as string;
		};
		const spring = await batch('Spring check', 'closed');
		const autumn = await batch('Autumn check');
		const [done] = await tdb()('audit_items')
			.insert({
				organisation_id: t.org.id,
				batch_id: spring,
				dwelling_id: decided.dwellingId,
				picked_because: 'test',
				decision: 'accepted-with-advice',
				decided_by: t.supervisor.id,
				decided_at: new Date('2026-11-02T10:00:00Z')
			})
			.returning('id');
		const [open] = await tdb()('audit_items')
			.insert({
				organisation_id: t.org.id,
				batch_id: autumn,
				dwelling_id: waiting.dwellingId,
				picked_because: 'test'
			})
			.returning('id');

		const r = (await reach.getReach(t.org.id, t.board.id))!;
		const by = new Map(r.dwellings.map((d) => [d.id, d]));
		expect(by.get(waiting.dwellingId)!.audit).toEqual({
			itemId: open.id,
			batchId: autumn,
			batchName: 'Autumn check',
			open: true,
			decision: null,
			decidedAt: null
		});
		expect(by.get(decided.dwellingId)!.audit).toMatchObject({
			itemId: done.id,
			batchName: 'Spring check',
			open: false,
			decision: 'accepted-with-advice',
			decidedAt: '2026-11-02T10:00:00.000Z'
		});
		expect(by.get(never.dwellingId)!.audit).toBeNull();
		expect(r.totals).toMatchObject({ dwellings: 3, inOpenAudit: 1, accepted: 1 });
	});

	it('counts the work on a current revision that is superseded with no newer one (nothing to move to)', async () => {
		const t = await setup();
		await wall(t, t.board);
		await wall(t, t.board);
		expect((await reach.getReach(t.org.id, t.board.id))!.onSupersededCurrent).toBeNull();
		await lib.setMaterialStatus(actor(t.supervisor), t.board.id, 'supersede');
		const r = (await reach.getReach(t.org.id, t.board.id))!;
		expect(r.to).toMatchObject({ revision: 1, status: 'superseded' });
		expect(r.onSupersededCurrent).toEqual({ elements: 2, dwellings: 2 });
		expect(r.totals.elements).toBe(0);
	});

	it('marks an element whose stored result is from another engine version', async () => {
		const t = await setup();
		const w = await wall(t, t.board);
		await tdb()('elements').where({ id: w.elementId }).update({ engine_version: '0.0.1' });
		await correct(t, t.board.id);
		const r = (await reach.getReach(t.org.id, t.board.id))!;
		expect(r.dwellings[0].elements[0].stale).toBe(true);
		expect(r.totals.staleResults).toBe(1);
	});

	it('moves the chosen elements: versioned, logged, counted as a change since issue, idempotent, skipping a dwelling to reopen', async () => {
		const t = await setup();
		const a = await wall(t, t.board);
		await issueReport(t.org.id, a.dwellingId, t.assessor.id);
		// as issuing does: the dwelling matches its issued report
		await tdb()('dwellings').where({ id: a.dwellingId }).update({ issue_changes: 0 });
		const locked = await wall(t, t.board, { status: 'accepted' });
		const rev2 = await correct(t, t.board.id);
		const before = (await elements.getElement(t.org.id, a.elementId))!;

		const res = await callHandler(
			moveApi.POST,
			t.assessor,
			'POST',
			`/api/v1/materials/${t.board.id}/reach/move`,
			{
				params: { materialId: t.board.id },
				body: { elementIds: [a.elementId, locked.elementId], toRevisionId: rev2.revisionId }
			}
		);
		expect(res.status).toBe(200);
		expect(res.json.move).toMatchObject({ state: 'done', total: 2, moved: 1, skipped: 1, background: false });
		const skipped = res.json.items.find((i: { elementId: string }) => i.elementId === locked.elementId);
		expect(skipped).toMatchObject({ outcome: 'skipped', dwellingReference: locked.reference });
		expect(skipped.reason).toMatch(/^Reopen the dwelling first\./);

		const after = (await elements.getElement(t.org.id, a.elementId))!;
		expect(after.version).toBe(before.version + 1);
		expect(after.buildUp!.layers[1]).toMatchObject({
			materialRevisionId: rev2.revisionId,
			lambda: 0.04,
			mu: 1,
			thicknessMm: 100
		});
		expect(after.lastResult!.uValue).toBeCloseTo(handU(0.04), 3);
		const lockedNow = (await elements.getElement(t.org.id, locked.elementId))!;
		expect(lockedNow.buildUp!.layers[1].materialRevisionId).toBe(t.board.revisionId);

		const logs = await tdb()('activity_log').where({
			organisation_id: t.org.id,
			action: 'move-revision',
			entity: 'element'
		});
		expect(logs.map((l) => l.entity_id)).toEqual([a.elementId]);
		expect(logs[0].details).toMatchObject({
			fromRevisions: [1],
			toRevision: 2,
			toRevisionId: rev2.revisionId,
			versionBefore: before.version,
			versionAfter: after.version,
			layers: [{ layerIndex: 1, fromRevisionId: t.board.revisionId, fromRevision: 1, toRevision: 2 }]
		});
		// the element service logged its own update, and the dwelling now differs from its issued report
		expect(await tdb()('activity_log').where({ entity_id: a.elementId, action: 'update' })).toHaveLength(1);
		const d = await tdb()('dwellings').where({ id: a.dwellingId }).first('issue_changes');
		expect(d.issue_changes).toBeGreaterThan(0);
		// the reach now holds only the element that waits for its dwelling to be reopened
		const r = (await reach.getReach(t.org.id, t.board.id))!;
		expect(r.dwellings.flatMap((x) => x.elements.map((e) => e.id))).toEqual([locked.elementId]);

		// the same move again moves nothing
		const again = await reach.startMove(asMember(t.assessor), t.board.id, {
			elementIds: [a.elementId],
			toRevisionId: rev2.revisionId
		});
		expect(again.move).toMatchObject({ state: 'done', moved: 0, already: 1 });
		expect((await elements.getElement(t.org.id, a.elementId))!.version).toBe(after.version);
		expect(
			await tdb()('activity_log').where({
				organisation_id: t.org.id,
				action: 'move-revision',
				entity: 'element'
			})
		).toHaveLength(1);
	});

	it('refuses a move to a revision that is not the current one, a supervisor, and a bad body', async () => {
		const t = await setup();
		const w = await wall(t, t.board);
		await correct(t, t.board.id);
		const url = `/api/v1/materials/${t.board.id}/reach/move`;
		const post = (member: typeof t.assessor, body: unknown) =>
			callHandler(moveApi.POST, member, 'POST', url, { params: { materialId: t.board.id }, body });
		const stale = await post(t.assessor, { elementIds: [w.elementId], toRevisionId: t.board.revisionId });
		expect(stale.status).toBe(409);
		expect(stale.json.message).toMatch(/Revision 1 is not the material’s current revision; revision 2 is/);
		expect((await post(t.supervisor, { elementIds: [w.elementId], toRevisionId: randomUUID() })).status).toBe(
			403
		);
		const bad = await post(t.assessor, { elementIds: ['nope'], toRevisionId: 'x' });
		expect(bad.status).toBe(400);
		expect(bad.json.issues.map((i: { path: string }) => i.path).sort()).toEqual([
			'elementIds.0',
			'toRevisionId'
		]);
	});

	it('says per element when one is not on this material, and moves an element whose layer was edited by hand', async () => {
		const t = await setup();
		const w = await wall(t, t.board);
		const rev2 = await correct(t, t.board.id);
		const stranger = await makeDwelling(t.org.id, t.assessor.id);
		const plain = await elements.createElement(asMember(t.assessor), stranger.id, {
			name: 'Plain wall',
			kind: 'external-wall',
			area: 10,
			buildUp: { layers: [{ name: 'Brick', thicknessMm: 215, lambda: 0.77, mu: 10 }] }
		});
		const out = await reach.startMove(asMember(t.assessor), t.board.id, {
			elementIds: [w.elementId, plain.id, randomUUID()],
			toRevisionId: rev2.revisionId
		});
		const by = new Map(out.items.map((i) => [i.elementId, i]));
		expect(by.get(w.elementId)?.outcome).toBe('moved');
		expect(by.get(plain.id)).toMatchObject({
			outcome: 'skipped',
			reason: 'It has no layer of this material.'
		});
		expect(out.move).toMatchObject({ total: 3, moved: 1, skipped: 2 });
	});

	it('runs a move of more than 50 elements as a background job with progress, and a second run moves nothing', async () => {
		const t = await setup();
		const ids: string[] = [];
		for (let i = 0; i < 6; i++) {
			const d = await makeDwelling(t.org.id, t.assessor.id);
			for (let k = 0; k < 9; k++) {
				const el = await elements.createElement(asMember(t.assessor), d.id, {
					name: `Wall ${k + 1}`,
					kind: 'external-wall',
					area: 10,
					buildUp: { layers: wallLayers(t.board) },
					internal: { temperature: 20, humidityClass: 3 }
				});
				ids.push(el.id);
			}
		}
		const rev2 = await correct(t, t.board.id);
		const res = await callHandler(
			moveApi.POST,
			t.admin,
			'POST',
			`/api/v1/materials/${t.board.id}/reach/move`,
			{
				params: { materialId: t.board.id },
				body: { elementIds: ids, toRevisionId: rev2.revisionId }
			}
		);
		expect(res.status).toBe(202);
		expect(res.json.move).toMatchObject({ total: 54, background: true });
		const moveId = res.json.move.id as string;
		// the job is on the queue, keyed by the move
		const jobs = await tdb()
			.withSchema('pgboss')
			.from('job')
			.where({ name: worker.REACH_QUEUE, singleton_key: moveId });
		expect(jobs.length).toBe(1);

		let progress: { move: { state: string; done: number; moved: number } } | null = null;
		for (let i = 0; i < 240; i++) {
			const p = await callHandler(
				progressApi.GET,
				t.assessor,
				'GET',
				`/api/v1/materials/${t.board.id}/reach/move/${moveId}`,
				{
					params: { materialId: t.board.id, moveId }
				}
			);
			progress = p.json;
			if (progress!.move.state === 'done') break;
			await new Promise((r) => setTimeout(r, 250));
		}
		expect(progress!.move).toMatchObject({ state: 'done', done: 54, moved: 54 });
		expect((await reach.getReach(t.org.id, t.board.id))!.totals.elements).toBe(0);
		expect(
			await tdb()('activity_log').where({
				organisation_id: t.org.id,
				action: 'move-revision',
				entity: 'element'
			})
		).toHaveLength(54);
		// the job again (a retry, or queued twice) finds the move done and moves nothing
		expect(await move.runMove(moveId)).toBe(false);
		// a second move of the same elements: every one is on the revision already
		const again = await reach.startMove(asMember(t.admin), t.board.id, {
			elementIds: ids,
			toRevisionId: rev2.revisionId
		});
		for (let i = 0; i < 240 && again.move.state !== 'done'; i++) {
			await new Promise((r) => setTimeout(r, 250));
			again.move = (await reach.getMove(t.org.id, t.board.id, again.move.id))!.move;
		}
		expect(again.move).toMatchObject({ state: 'done', moved: 0, already: 54 });
	});

	it('continues a move whose run stopped half-way after the elements it had done', async () => {
		const t = await setup();
		const ws = [await wall(t, t.board), await wall(t, t.board), await wall(t, t.board)];
		const rev2 = await correct(t, t.board.id);
		const [row] = await tdb()('material_moves')
			.insert({
				organisation_id: t.org.id,
				material_id: t.board.id,
				to_revision_id: rev2.revisionId,
				requested_by: t.assessor.id,
				element_ids: ws.map((w) => w.elementId),
				total: 3,
				state: 'running',
				// the run that held it died two minutes ago
				heartbeat_at: new Date(Date.now() - 120_000)
			})
			.returning('id');
		// it had done the first element (outcome written) before it stopped
		await move.moveElement(
			asMember(t.assessor),
			{ materialId: t.board.id, toRevisionId: rev2.revisionId, moveId: row.id },
			ws[0].elementId
		);
		await tdb()('material_move_items').insert({
			move_id: row.id,
			element_id: ws[0].elementId,
			outcome: 'moved',
			from_revision: 1,
			to_revision: 2
		});
		await tdb()('material_moves').where({ id: row.id }).update({ done: 1, moved: 1 });

		expect(await move.runMove(row.id, { chunkSize: 1 })).toBe(true);
		const m = (await reach.getMove(t.org.id, t.board.id, row.id))!;
		expect(m.move).toMatchObject({ state: 'done', done: 3, moved: 3, already: 0 });
		// each element was saved once: the first by the stopped run, the others by this one
		for (const w of ws) expect((await elements.getElement(t.org.id, w.elementId))!.version).toBe(2);
	});

	it('counts the reach of the materials an import revised, by code', async () => {
		const t = await setup();
		await wall(t, t.board);
		await wall(t, t.board);
		await correct(t, t.board.id);
		const quiet = await lib.createMaterial(actor(t.assessor), boardValues());
		expect(await reach.reachOfCodes(t.org.id, [t.board.code, quiet.code, 'NOT-A-CODE'])).toEqual([
			{ materialId: t.board.id, code: t.board.code, revision: 2, elements: 2, dwellings: 2 }
		]);
	});
});
