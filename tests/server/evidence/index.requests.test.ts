// Evidence requested, answered, attached to elements and layers, kept once reported: the supervisor's
// request answered by the assessor's next upload, the deletion rule (until an issued report lists it),
// targets checked against the dwelling, and the list an issued report takes. Against PostgreSQL and a
// real S3 API (s3rver on loopback). Envelo's own behaviour (common practice, no source).
import { describe, it, expect, beforeAll, afterAll } from 'vitest';
import sharp from 'sharp';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { asMember, callHandler, fakeEvent, hasDatabase, makeTeam, tdb } from '../../factories';
import { issueReport, makeDwelling, makeElement } from '../../factories-audit';
import { multipart, startFakeS3 } from './s3';

type Team = Awaited<ReturnType<typeof makeTeam>>;
type TestMember = Team['assessor'];

const png = (w = 40, h = 30) =>
	sharp({ create: { width: w, height: h, channels: 3, background: { r: 90, g: 140, b: 200 } } })
		.png()
		.toBuffer();

/** An ISO date `days` from today (UTC). */
const day = (days: number) => new Date(Date.now() + days * 86_400_000).toISOString().slice(0, 10);

const LAYERS = [
	{ name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
	{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1 },
	{ name: 'Brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
];

describe.skipIf(!hasDatabase)('evidence requests, targets and the deletion rule', () => {
	let s3: Awaited<ReturnType<typeof startFakeS3>>;
	let uploadRoute: typeof import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/evidence/+server');
	let deleteRoute: typeof import('../../../src/routes/api/v1/evidence/[evidenceId=uuid]/+server');
	let requestsRoute: typeof import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/evidence-requests/+server');
	let answerRoute: typeof import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/evidence-requests/[requestId=uuid]/answer/+server');
	let evidence: typeof import('../../../src/lib/server/evidence');

	beforeAll(async () => {
		s3 = await startFakeS3();
		uploadRoute = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/evidence/+server');
		deleteRoute = await import('../../../src/routes/api/v1/evidence/[evidenceId=uuid]/+server');
		requestsRoute =
			await import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/evidence-requests/+server');
		answerRoute =
			await import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/evidence-requests/[requestId=uuid]/answer/+server');
		evidence = await import('../../../src/lib/server/evidence');
	});
	afterAll(async () => {
		await s3?.stop();
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	/** A team, a dwelling of its assessor's with a three-layer wall, and an open audit batch with its item. */
	async function world() {
		const t = await makeTeam();
		const dwelling = await makeDwelling(t.org.id, t.assessor.id);
		const wallId = await makeElement(t.org.id, dwelling.id, { name: 'North wall', layers: LAYERS });
		const [batch] = await tdb()('audit_batches')
			.insert({
				organisation_id: t.org.id,
				name: 'Evidence check',
				sampling: JSON.stringify({ rule: 'all', includeFlagged: false }),
				seed: 'evidence',
				created_by: t.supervisor.id
			})
			.returning('id');
		const [item] = await tdb()('audit_items')
			.insert({
				organisation_id: t.org.id,
				batch_id: batch.id,
				dwelling_id: dwelling.id,
				picked_because: 'all'
			})
			.returning('id');
		return { ...t, dwelling, wallId, batchId: batch.id as string, itemId: item.id as string };
	}
	type World = Awaited<ReturnType<typeof world>>;

	async function upload(as: TestMember, w: World, fields: [string, string][] = [], name = 'photo.png') {
		const path = `/api/v1/dwellings/${w.dwelling.id}/evidence`;
		const request = multipart(`http://127.0.0.1${path}`, fields, { name, bytes: await png() });
		const event = { ...fakeEvent(as, path), request, params: { dwellingId: w.dwelling.id } };
		try {
			const res = await uploadRoute.POST(event as never);
			return { status: res.status, json: await res.json() };
		} catch (e: any) {
			if (typeof e?.status === 'number') return { status: e.status as number, json: e.body };
			throw e;
		}
	}
	const ask = (as: TestMember, w: World, body: unknown) =>
		callHandler(requestsRoute.POST, as, 'POST', `/api/v1/audit/items/${w.itemId}/evidence-requests`, {
			params: { itemId: w.itemId },
			body
		});
	const remove = (as: TestMember, id: string) =>
		callHandler(deleteRoute.DELETE, as, 'DELETE', `/api/v1/evidence/${id}`, { params: { evidenceId: id } });
	const itemLog = (w: World) =>
		tdb()('activity_log')
			.where({ organisation_id: w.org.id, entity: 'audit_item', entity_id: w.itemId })
			.orderBy('id')
			.select('action', 'user_id', 'details');

	it("answers the supervisor's request with the assessor's next upload to the dwelling", async () => {
		const w = await world();
		const asked = await ask(w.supervisor, w, {
			note: 'A photo of the insulation with a tape measure, please.',
			dueDate: day(7)
		});
		expect(asked.status, asked.text).toBe(201);
		expect(asked.json).toMatchObject({
			auditItemId: w.itemId,
			batchId: w.batchId,
			dwellingId: w.dwelling.id,
			dueDate: day(7),
			answeredAt: null,
			overdue: false,
			requestedBy: { id: w.supervisor.id }
		});

		const up = await upload(w.assessor, w, [
			['elementId', w.wallId],
			['layerIndex', '1']
		]);
		expect(up.status, JSON.stringify(up.json)).toBe(201);
		const list = await callHandler(
			requestsRoute.GET,
			w.supervisor,
			'GET',
			`/api/v1/audit/items/${w.itemId}/evidence-requests`,
			{
				params: { itemId: w.itemId }
			}
		);
		expect(list.json.items).toEqual([
			expect.objectContaining({
				id: asked.json.id,
				answeredBy: { id: w.assessor.id, name: expect.any(String) },
				answerEvidenceId: up.json.id,
				answeredAt: expect.any(String)
			})
		]);
		const log = await itemLog(w);
		expect(log.map((l) => l.action)).toEqual(['evidence-request', 'evidence-answer']);
		expect(log[1]).toMatchObject({
			user_id: w.assessor.id,
			details: { requestId: asked.json.id, evidenceId: up.json.id, automatic: true }
		});
		const uploaded = await tdb()('activity_log').where({ entity: 'evidence', entity_id: up.json.id }).first();
		expect(uploaded.details).toMatchObject({ answeredRequestIds: [asked.json.id], layerIndex: 1 });

		// A request made after that upload stays open until the next one, or until it is answered.
		const later = await ask(w.supervisor, w, { note: 'The data sheet of the membrane.', dueDate: day(0) });
		const still = await tdb()('evidence_requests').where({ id: later.json.id }).first();
		expect(still.answered_at).toBeNull();
		const path = `/api/v1/audit/items/${w.itemId}/evidence-requests/${later.json.id}/answer`;
		const params = { itemId: w.itemId, requestId: later.json.id };
		const answered = await callHandler(answerRoute.POST, w.assessor, 'POST', path, {
			params,
			body: { evidenceId: up.json.id }
		});
		expect(answered.status, answered.text).toBe(200);
		expect(answered.json).toMatchObject({ answerEvidenceId: up.json.id, answeredBy: { id: w.assessor.id } });
		const again = await callHandler(answerRoute.POST, w.assessor, 'POST', path, { params, body: {} });
		expect(again.status).toBe(409);
		expect((await itemLog(w)).at(-1)).toMatchObject({
			action: 'evidence-answer',
			details: { requestId: later.json.id, automatic: false }
		});
	});

	it('checks who asks and what: supervisors and admins, a note, a due date from today on, an open batch', async () => {
		const w = await world();
		const byAssessor = await ask(w.assessor, w, { note: 'x', dueDate: day(3) });
		expect(byAssessor.status).toBe(403);
		const bad = await ask(w.supervisor, w, { note: '  ', dueDate: day(-1) });
		expect(bad.status).toBe(400);
		expect(bad.json.issues).toEqual([
			{ path: 'note', message: 'note is required: say what evidence is needed' },
			{ path: 'dueDate', message: 'dueDate must be today or later' }
		]);
		expect((await ask(w.supervisor, w, { note: 'x', dueDate: '3 March' })).json.issues).toEqual([
			{ path: 'dueDate', message: 'dueDate must be a date, YYYY-MM-DD' }
		]);
		const other = await makeTeam();
		expect((await ask(other.supervisor, w, { note: 'x', dueDate: day(3) })).status).toBe(404);
		expect((await ask(w.admin, w, { note: 'By the admin', dueDate: day(3) })).status).toBe(201);
		await tdb()('audit_batches').where({ id: w.batchId }).update({ status: 'closed' });
		const closed = await ask(w.supervisor, w, { note: 'x', dueDate: day(3) });
		expect(closed).toMatchObject({
			status: 409,
			json: { message: 'The batch is closed; reopen it to request evidence.' }
		});
	});

	it('shows an open request past its due date as overdue', async () => {
		const w = await world();
		const asked = await ask(w.supervisor, w, { note: 'Photo of the loft hatch.', dueDate: day(1) });
		await tdb()('evidence_requests')
			.where({ id: asked.json.id })
			.update({ due_date: day(-2) });
		const [r] = (await evidence.listRequestsForItem(w.org.id, w.itemId))!;
		expect(r).toMatchObject({ dueDate: day(-2), overdue: true });
	});

	it('attaches evidence to an element or a layer of it, checked against the dwelling', async () => {
		const w = await world();
		const otherDwelling = await makeDwelling(w.org.id, w.assessor.id);
		const foreignWall = await makeElement(w.org.id, otherDwelling.id, { name: 'Other wall', layers: LAYERS });
		expect((await upload(w.assessor, w, [['elementId', foreignWall]])).json.message).toBe(
			'No such element in this dwelling.'
		);
		const beyond = await upload(w.assessor, w, [
			['elementId', w.wallId],
			['layerIndex', '3']
		]);
		expect(beyond.status).toBe(400);
		expect(beyond.json.message).toBe('layerIndex: the element has 3 layers (layerIndex 0 to 2).');
		const alone = await upload(w.assessor, w, [['layerIndex', '0']]);
		expect(alone.json.issues).toEqual([
			{ path: 'layerIndex', message: 'a layer needs its element: give elementId as well' }
		]);
		expect((await upload(w.assessor, w, [['elementId', 'wall']])).json.issues).toEqual([
			{ path: 'elementId', message: 'elementId must be an id' }
		]);

		const onLayer = await upload(
			w.assessor,
			w,
			[
				['elementId', w.wallId],
				['layerIndex', '1']
			],
			'mw.png'
		);
		expect(onLayer.json).toMatchObject({
			elementId: w.wallId,
			elementName: 'North wall',
			layerIndex: 1,
			layerName: 'Mineral wool'
		});
		// The database refuses an element of another dwelling, whatever the code does.
		const refused = await tdb()('evidence')
			.where({ id: onLayer.json.id })
			.update({ element_id: foreignWall })
			.catch((e) => e);
		expect(refused).toMatchObject({ code: expect.stringMatching(/^23/) });

		// A deleted element leaves its evidence on the dwelling.
		await tdb()('elements').where({ id: w.wallId }).delete();
		const row = await tdb()('evidence').where({ id: onLayer.json.id }).first();
		expect(row).toMatchObject({ element_id: null, layer_index: null, layer_name: 'Mineral wool' });
	});

	it('deletes evidence with its files until an issued report lists it; then it is kept', async () => {
		const w = await world();
		const first = await upload(w.assessor, w, [], 'first.png');
		const prefix = `evidence/${w.org.id}/${w.dwelling.id}/`;
		expect(await s3.keys(prefix)).toEqual([
			`${prefix}${first.json.id}`,
			`${prefix}${first.json.id}-thumbnail.jpg`
		]);
		expect(first.json.deletable).toBe(true);
		expect((await remove(w.supervisor, first.json.id)).status).toBe(403);
		const gone = await remove(w.assessor, first.json.id);
		expect(gone.status).toBe(204);
		expect(await tdb()('evidence').where({ id: first.json.id })).toEqual([]);
		expect(await s3.keys(prefix)).toEqual([]);

		// Deleting the upload that answered a request opens the request again.
		const asked = await ask(w.supervisor, w, { note: 'Photo of the cavity.', dueDate: day(5) });
		const second = await upload(w.assessor, w, [], 'second.png');
		expect((await tdb()('evidence_requests').where({ id: asked.json.id }).first()).answer_evidence_id).toBe(
			second.json.id
		);
		expect((await remove(w.admin, second.json.id)).status).toBe(204);
		expect(await tdb()('evidence_requests').where({ id: asked.json.id }).first()).toMatchObject({
			answered_at: null,
			answered_by: null,
			answer_evidence_id: null
		});

		const kept = await upload(w.assessor, w, [['elementId', w.wallId]], 'kept.png');
		await issueReport(w.org.id, w.dwelling.id, w.assessor.id);
		const listed = await evidence.evidenceForReport(tdb(), w.org.id, w.dwelling.id);
		expect(listed).toEqual([
			{
				name: 'kept.png',
				sha256: kept.json.sha256,
				contentType: 'image/png',
				bytes: kept.json.bytes,
				elementName: 'North wall',
				layerIndex: null,
				layerName: null,
				uploadedAt: kept.json.createdAt
			}
		]);
		const refused = await remove(w.admin, kept.json.id);
		expect(refused.status).toBe(409);
		expect(refused.json.message).toMatch(/listed in an issued report of the dwelling, so it is kept/);
		const list = await evidence.listEvidence(asMember(w.admin), w.dwelling.id);
		expect(list![0]).toMatchObject({ deletable: false, reportedAt: expect.any(String) });
		// The database keeps it too, and never lets it change.
		const direct = await tdb()('evidence')
			.where({ id: kept.json.id })
			.delete()
			.catch((e) => e);
		expect(direct).toMatchObject({ code: '23514' });
		expect(String(direct.message)).toMatch(/listed in an issued report is kept/);
		const changed = await tdb()('evidence')
			.where({ id: kept.json.id })
			.update({ name: 'other.png' })
			.catch((e) => e);
		expect(changed).toMatchObject({ code: '23514' });
		expect(await s3.keys(prefix)).toHaveLength(2);
		expect((await remove(w.admin, '00000000-0000-4000-8000-000000000000')).status).toBe(404);
	});
	it('lists every evidence file with its SHA-256 in the issued report, snapshot and PDF alike', async () => {
		const w = await world();
		const photo = await upload(
			w.assessor,
			w,
			[
				['elementId', w.wallId],
				['layerIndex', '1']
			],
			'cavity-fill.png'
		);
		expect(photo.status).toBe(201);
		const reports = await import('../../../src/lib/server/reports');
		const caller = { userId: w.assessor.id, organisationId: w.org.id };
		const issued = await reports.issueReport(caller, { dwellingId: w.dwelling.id }, 'http://127.0.0.1:3999');
		const row = await tdb()('reports').where({ id: issued.id }).first('snapshot');
		expect(row.snapshot.evidence).toEqual([
			expect.objectContaining({
				name: 'cavity-fill.png',
				sha256: photo.json.sha256,
				elementName: 'North wall',
				layerIndex: 1
			})
		]);
		const pdf = await reports.getReportPdf(w.org.id, issued.id);
		const file = join(mkdtempSync(join(tmpdir(), 'envelo-evidence-pdf-')), 'r.pdf');
		writeFileSync(file, pdf!.pdf);
		// poppler's pdftotext (Debian poppler-utils); the hash may wrap, so spaces are left out
		const text = execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' }).replace(/\s+/g, '');
		expect(text).toContain('keptwiththedwellingwhenthisreportwasissued');
		expect(text).toContain('cavity-fill.png');
		expect(text).toContain(photo.json.sha256);
	});
});
