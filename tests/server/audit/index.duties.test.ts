import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeMember, makeTeam, fakeEvent, tdb } from '../../factories';
import { asMember, ref } from '../../factories-dwellings';
import { makeClimate, makeDwelling, makeElement, makeLimitTable } from '../../factories-reports';
import { decisionRefusal, INDEPENDENCE_RULE } from '../../../src/lib/audit/rules';

// Separation of duties in the audit: nobody decides on a dwelling they assessed or whose report they
// issued, whatever their role (common practice, no source: a reviewer is independent of the work).

const ADA = '00000000-0000-4000-8000-00000000a001';
const BEN = '00000000-0000-4000-8000-00000000b001';
const DARA = '00000000-0000-4000-8000-00000000d001';

describe('the independence rule', () => {
	const none = { assessorId: null, formerAssessorIds: [], reports: [] };
	it('refuses the assessor, a former assessor and any issuer, saying why; others decide', () => {
		expect(decisionRefusal(ADA, { ...none, assessorId: ADA })).toBe(
			`You cannot decide on this dwelling: you are its assessor. ${INDEPENDENCE_RULE}`
		);
		expect(decisionRefusal(ADA, { ...none, assessorId: BEN, formerAssessorIds: [ADA, BEN] })).toMatch(
			/: you were its assessor\./
		);
		const reports = [
			{ number: 'T-2026-0001', revision: 1, issuedBy: ADA },
			{ number: 'T-2026-0001', revision: 2, issuedBy: ADA }
		];
		expect(decisionRefusal(ADA, { ...none, assessorId: ADA, reports })).toMatch(
			/: you are its assessor and you issued its report T-2026-0001 revision 1 \(and 1 more\)\./
		);
		expect(decisionRefusal(DARA, { assessorId: BEN, formerAssessorIds: [ADA], reports })).toBeNull();
	});
});

describe.skipIf(!hasDatabase)('deciding on an audited dwelling (PostgreSQL)', async () => {
	const audits = await import('../../../src/lib/server/audit');
	const dwellings = await import('../../../src/lib/server/dwellings');
	const reports = await import('../../../src/lib/server/reports');
	const decisionApi = await import('../../../src/routes/api/v1/audit/items/[itemId=uuid]/decision/+server');
	const itemPage =
		await import('../../../src/routes/(app)/audit/[batchId=uuid]/items/[itemId=uuid]/+page.server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	type TestMember = Parameters<typeof fakeEvent>[0] & {};

	/** A team, a dwelling of the assessor's with one element, ready to issue. */
	async function setup() {
		const t = await makeTeam();
		await makeLimitTable(t.org.id);
		const climateId = await makeClimate(t.org.id);
		const d = await makeDwelling(t.org.id, { assessorId: t.assessor.id, climateId });
		await makeElement(t.org.id, d.id);
		const row = await tdb()('dwellings').where({ id: d.id }).first('reference');
		return { ...t, dwelling: { id: d.id, reference: row.reference as string } };
	}
	const version = async (id: string) =>
		Number((await tdb()('dwellings').where({ id }).first('version')).version);
	const reassign = async (by: TestMember, id: string, assessorId: string) =>
		dwellings.updateDwelling(asMember(by), id, { assessorId, version: await version(id) });
	const issue = (by: { id: string; organisationId: string }, dwellingId: string) =>
		reports.issueReport({ userId: by.id, organisationId: by.organisationId }, { dwellingId }, 'http://x');
	async function batchOf(by: TestMember, reference: string) {
		const b = await audits.createBatch(asMember(by), {
			name: `Check ${ref()}`,
			source: 'references',
			filter: {},
			references: [reference],
			sampling: { rule: 'all', includeFlagged: false }
		});
		const [item] = await audits.listItems(by.organisationId, b.id);
		return item;
	}
	async function decideByApi(by: TestMember, itemId: string) {
		const event = fakeEvent(by, `/api/v1/audit/items/${itemId}/decision`);
		const res: Response = await (decisionApi.POST as (e: never) => Promise<Response>)({
			...event,
			params: { itemId },
			request: new Request('http://x', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ decision: 'accepted' })
			})
		} as never);
		return { status: res.status, body: await res.json() };
	}
	async function pageRefusal(by: TestMember, item: { id: string; batchId: string }) {
		const event = fakeEvent(by, `/audit/${item.batchId}/items/${item.id}`);
		const data = (await (itemPage.load as (e: never) => Promise<{ decisionRefusal: string | null }>)({
			...event,
			params: { batchId: item.batchId, itemId: item.id }
		} as never))!;
		return data.decisionRefusal;
	}

	it('an admin who made herself the assessor and issued cannot accept her own work (module, API, page)', async () => {
		const t = await setup();
		await reassign(t.admin, t.dwelling.id, t.admin.id);
		const issued = await issue(t.admin, t.dwelling.id);
		const item = await batchOf(t.admin, t.dwelling.reference);

		await expect(
			audits.decideItem(asMember(t.admin), item.id, { decision: 'accepted', comment: '' })
		).rejects.toMatchObject({
			status: 403,
			message: `You cannot decide on this dwelling: you are its assessor and you issued its report ${issued.number} revision ${issued.revision}. ${INDEPENDENCE_RULE}`
		});
		const api = await decideByApi(t.admin, item.id);
		expect(api.status).toBe(403);
		expect(api.body.message).toMatch(/you are its assessor/);
		expect(await pageRefusal(t.admin, item)).toMatch(/^You cannot decide on this dwelling/);
		const after = await tdb()('audit_items').where({ id: item.id }).first('decision');
		expect(after.decision).toBeNull();
		expect(await tdb()('activity_log').where({ entity_id: item.id, action: 'audit-decision' })).toHaveLength(
			0
		);

		// The supervisor, who had no part in it, decides; the page offers her the form.
		expect(await pageRefusal(t.supervisor, item)).toBeNull();
		const decided = await audits.decideItem(asMember(t.supervisor), item.id, {
			decision: 'accepted',
			comment: ''
		});
		expect(decided.decision).toBe('accepted');
	});

	it('handing the dwelling on afterwards does not make the issuer or a former assessor independent', async () => {
		const t = await setup();
		const carla = await makeMember(t.org.id, 'assessor');
		const otherAdmin = await makeMember(t.org.id, 'admin');
		// The admin issues as assessor, then hands the dwelling to Carla.
		await reassign(t.admin, t.dwelling.id, t.admin.id);
		await issue(t.admin, t.dwelling.id);
		await reassign(t.admin, t.dwelling.id, carla.id);
		// A second admin was briefly its assessor but issued nothing.
		await reassign(otherAdmin, t.dwelling.id, otherAdmin.id);
		await reassign(otherAdmin, t.dwelling.id, carla.id);
		const item = await batchOf(t.supervisor, t.dwelling.reference);
		await expect(
			audits.decideItem(asMember(t.admin), item.id, { decision: 'accepted', comment: '' })
		).rejects.toMatchObject({
			status: 403,
			message: expect.stringMatching(/: you were its assessor and you issued its report /)
		});
		await expect(
			audits.decideItem(asMember(otherAdmin), item.id, { decision: 'accepted', comment: '' })
		).rejects.toMatchObject({ status: 403, message: expect.stringMatching(/: you were its assessor\./) });
		// A third admin with no part in it may decide.
		const third = await makeMember(t.org.id, 'admin');
		const ok = await audits.decideItem(asMember(third), item.id, { decision: 'accepted', comment: '' });
		expect(ok.decidedBy).toBe(third.id);
	});
});
