import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeMember, makeTeam, tdb, fakeEvent } from '../../factories';
import { asMember, ref } from '../../factories-dwellings';
import { issueRefusal, reassignRefusal } from '../../../src/lib/dwellings/rules';

// Who a dwelling's assessor is, who may change it and who issues its reports: Envelo's own rules
// (common practice, no source: the person who signs a declaration of having done the assessment is the
// person of record who did it, and a change of that person is recorded).

const BEN = '00000000-0000-4000-8000-00000000b001';
const CARLA = '00000000-0000-4000-8000-00000000c001';
const ADA = '00000000-0000-4000-8000-00000000a001';
const DARA = '00000000-0000-4000-8000-00000000d001';

describe('the rules of assignment and issuing', () => {
	it('an admin names anyone; an assessor hands over their own or takes on an unassigned one', () => {
		const ben = { userId: BEN, role: 'assessor' as const };
		expect(reassignRefusal({ userId: ADA, role: 'admin' }, BEN, CARLA)).toBeNull();
		expect(reassignRefusal({ userId: ADA, role: 'admin' }, null, ADA)).toBeNull();
		expect(reassignRefusal(ben, BEN, CARLA)).toBeNull(); // handing over
		expect(reassignRefusal(ben, BEN, null)).toBeNull(); // giving it up
		expect(reassignRefusal(ben, null, BEN)).toBeNull(); // taking on an unassigned one
		expect(reassignRefusal(ben, CARLA, CARLA)).toBeNull(); // no change is no reassignment
		expect(reassignRefusal(ben, CARLA, BEN)).toMatch(/another assessor’s/);
		expect(reassignRefusal(ben, null, CARLA)).toMatch(/no assessor: you may take it on yourself/);
		expect(reassignRefusal({ userId: DARA, role: 'supervisor' }, BEN, DARA)).toMatch(
			/Only an admin or the dwelling’s assessor/
		);
	});

	it('only the dwelling’s assessor issues its reports, an admin included', () => {
		expect(issueRefusal({ userId: BEN, role: 'assessor' }, BEN)).toBeNull();
		expect(issueRefusal({ userId: ADA, role: 'admin' }, ADA)).toBeNull();
		expect(issueRefusal({ userId: BEN, role: 'assessor' }, CARLA)).toMatch(
			/Only the dwelling’s assessor issues its reports/
		);
		expect(issueRefusal({ userId: ADA, role: 'admin' }, CARLA)).toMatch(/become its assessor first/);
		expect(issueRefusal({ userId: BEN, role: 'assessor' }, null)).toMatch(/no assessor/);
		expect(issueRefusal({ userId: DARA, role: 'supervisor' }, DARA)).toMatch(
			/Only assessors and admins issue reports/
		);
	});
});

describe.skipIf(!hasDatabase)('reassigning a dwelling (PostgreSQL)', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const one = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/+server');
	const page = await import('../../../src/routes/(app)/dwellings/[dwellingId=uuid]/+page.server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	type M = Parameters<typeof fakeEvent>[0];
	async function patch(member: M, id: string, body: Record<string, unknown>) {
		const ev = fakeEvent(member, `/api/v1/dwellings/${id}`) as Record<string, unknown>;
		ev.request = new Request(`http://127.0.0.1/api/v1/dwellings/${id}`, {
			method: 'PATCH',
			body: JSON.stringify(body),
			headers: { 'content-type': 'application/json' }
		});
		ev.params = { dwellingId: id };
		const res = await (one.PATCH as (e: never) => Promise<Response>)(ev as never);
		return { status: res.status, body: await res.json() };
	}
	const assessorOf = async (id: string) =>
		(await tdb()('dwellings').where({ id }).first('assessor_id')).assessor_id as string | null;
	const reassignments = (id: string) =>
		tdb()('activity_log').where({ entity: 'dwelling', entity_id: id, action: 'reassign' }).orderBy('id');

	async function team() {
		const t = await makeTeam();
		const carla = await makeMember(t.org.id, 'assessor', 'Carla Test');
		return { ...t, carla };
	}

	it('an assessor cannot take another assessor’s dwelling (403), and nothing is written', async () => {
		const t = await team();
		const d = await dwellings.createDwelling(asMember(t.carla), { reference: ref('DUT') });
		const res = await patch(t.assessor, d.id, { assessorId: t.assessor.id, version: d.version });
		expect(res.status).toBe(403);
		expect(res.body.message).toMatch(/another assessor’s/);
		expect(res.body.issues[0].path).toBe('assessorId');
		expect(await assessorOf(d.id)).toBe(t.carla.id);
		expect(await reassignments(d.id)).toHaveLength(0);
	});

	it('the assessor hands over; the log keeps who it was before and after', async () => {
		const t = await team();
		const d = await dwellings.createDwelling(asMember(t.assessor), { reference: ref('DUT') });
		const res = await patch(t.assessor, d.id, { assessorId: t.carla.id, version: d.version });
		expect(res.status).toBe(200);
		expect(res.body.assessorId).toBe(t.carla.id);
		const [entry] = await reassignments(d.id);
		expect(entry.user_id).toBe(t.assessor.id);
		expect(entry.details).toEqual({
			reference: d.reference,
			from: { id: t.assessor.id, name: (await tdb()('users').where({ id: t.assessor.id }).first()).name },
			to: { id: t.carla.id, name: 'Carla Test' }
		});
		// Handed over, it is no longer the first assessor's to take back.
		const back = await patch(t.assessor, d.id, { assessorId: t.assessor.id, version: res.body.version });
		expect(back.status).toBe(403);
		// An admin may move it anywhere, logged the same way.
		const admin = await patch(t.admin, d.id, { assessorId: t.admin.id, version: res.body.version });
		expect(admin.status).toBe(200);
		const entries = await reassignments(d.id);
		expect(entries.map((e) => [e.details.from?.id ?? null, e.details.to?.id ?? null])).toEqual([
			[t.assessor.id, t.carla.id],
			[t.carla.id, t.admin.id]
		]);
	});

	it('resending the same assessor with other changes is no reassignment (the form sends it each time)', async () => {
		const t = await team();
		const d = await dwellings.createDwelling(asMember(t.carla), { reference: ref('DUT') });
		// Another assessor edits the address and sends the assessor unchanged, as the details form does.
		const res = await patch(t.assessor, d.id, {
			address: '2 Other Row',
			assessorId: t.carla.id,
			version: d.version
		});
		expect(res.status).toBe(200);
		expect(res.body.address).toBe('2 Other Row');
		expect(await reassignments(d.id)).toHaveLength(0);
	});

	it('an unassigned dwelling is taken on by an assessor for themselves only', async () => {
		const t = await team();
		const d = await dwellings.createDwelling(asMember(t.admin), { reference: ref('DUT') });
		expect(d.assessorId).toBeNull();
		const other = await patch(t.assessor, d.id, { assessorId: t.carla.id, version: d.version });
		expect(other.status).toBe(403);
		const self = await patch(t.assessor, d.id, { assessorId: t.assessor.id, version: d.version });
		expect(self.status).toBe(200);
		const [entry] = await reassignments(d.id);
		expect(entry.details.from).toBeNull();
		expect(entry.details.to.id).toBe(t.assessor.id);
	});

	it('a supervisor cannot be named a dwelling’s assessor, at creation or later', async () => {
		const t = await team();
		const bad = await dwellings
			.createDwelling(asMember(t.admin), { reference: ref('DUT'), assessorId: t.supervisor.id })
			.catch((e) => e);
		expect(bad.status).toBe(400);
		expect(bad.issues[0]).toMatchObject({ path: 'assessorId', message: expect.stringMatching(/supervisor/) });
		const d = await dwellings.createDwelling(asMember(t.admin), { reference: ref('DUT') });
		const res = await patch(t.admin, d.id, { assessorId: t.supervisor.id, version: d.version });
		expect(res.status).toBe(400);
		expect(await assessorOf(d.id)).toBeNull();
	});

	it('the details form answers a refused reassignment at the assessor’s field, not with an error page', async () => {
		const t = await team();
		const d = await dwellings.createDwelling(asMember(t.carla), { reference: ref('DUT') });
		const body = new FormData();
		for (const [k, v] of Object.entries({
			reference: d.reference,
			address: d.address,
			programme: '',
			clientName: '',
			clientEmail: '',
			assessorId: t.assessor.id,
			stage: d.stage,
			limitTableId: '',
			climateId: '',
			version: String(d.version)
		}))
			body.set(k, v);
		const ev = fakeEvent(t.assessor, `/dwellings/${d.id}`) as Record<string, unknown>;
		ev.request = new Request(`http://127.0.0.1/dwellings/${d.id}?/update`, { method: 'POST', body });
		ev.params = { dwellingId: d.id };
		const out = (await (page.actions.update as (e: never) => Promise<unknown>)(ev as never)) as {
			status: number;
			data: { form: { errors: Record<string, string[]> } };
		};
		expect(out.status).toBe(403);
		expect(out.data.form.errors.assessorId?.[0]).toMatch(/another assessor’s/);
		expect(await assessorOf(d.id)).toBe(t.carla.id);
	});
});
