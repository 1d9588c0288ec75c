import { describe, it, expect, afterAll } from 'vitest';
import { callHandler, hasDatabase, makeTeam, tdb } from '../../factories';
import { boardValues } from '../../factories-library';

// Verifying several library revisions at once: the same rules as one at a time (only an unverified
// current revision, never by its author; supervisors and admins), one transaction, each verification
// logged. Envelo's own rules (common practice, no source: a second person checks each entry).
describe.skipIf(!hasDatabase)('bulk verify', async () => {
	const lib = await import('../../../src/lib/server/library');
	const route = await import('../../../src/routes/api/v1/materials/verify/+server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});
	const actor = (m: { id: string; organisationId: string }) => ({
		userId: m.id,
		organisationId: m.organisationId
	});

	it('verifies the ticked revisions and leaves, with the reason, those that may not be', async () => {
		const t = await makeTeam();
		const other = await makeTeam();
		const a = await lib.createMaterial(actor(t.assessor), boardValues({ name: 'Board A' }));
		const b = await lib.createMaterial(actor(t.assessor), boardValues({ name: 'Board B' }));
		const own = await lib.createMaterial(
			actor(t.supervisor),
			boardValues({ name: 'Board by the supervisor' })
		);
		const done = await lib.createMaterial(actor(t.assessor), boardValues({ name: 'Board already verified' }));
		await lib.setMaterialStatus(actor(t.admin), done.id, 'verify');
		const old = await lib.createMaterial(actor(t.assessor), boardValues({ name: 'Board revised' }));
		await lib.updateMaterial(actor(t.assessor), old.id, {
			...boardValues({ code: old.code, name: 'Board revised', lambda: 0.032 })
		});
		const foreign = await lib.createMaterial(actor(other.assessor), boardValues({ name: 'Elsewhere' }));

		const ids = [
			a.revisionId,
			b.revisionId,
			own.revisionId,
			done.revisionId,
			old.revisionId,
			foreign.revisionId
		];
		const res = await callHandler(route.POST, t.supervisor, 'POST', '/api/v1/materials/verify', {
			body: { revisionIds: ids }
		});
		expect(res.status).toBe(200);
		expect(res.json.verified.map((v: { code: string }) => v.code).sort()).toEqual([a.code, b.code].sort());
		const reasons = Object.fromEntries(
			res.json.skipped.map((s: { revisionId: string; reason: string }) => [s.revisionId, s.reason])
		);
		expect(reasons[own.revisionId]).toMatch(/you wrote this revision/);
		expect(reasons[done.revisionId]).toBe('revision 1 is already verified');
		expect(reasons[old.revisionId]).toMatch(/no longer current/);
		expect(reasons[foreign.revisionId]).toBe('no such revision in this library');

		const status = async (id: string) =>
			(await tdb()('material_revisions').where({ id }).first('status')).status;
		expect(await status(a.revisionId)).toBe('verified');
		expect(await status(own.revisionId)).toBe('unverified');
		expect(await status(foreign.revisionId)).toBe('unverified');
		const log = await tdb()('activity_log').where({
			organisation_id: t.org.id,
			action: 'verify',
			user_id: t.supervisor.id
		});
		expect(log).toHaveLength(2);
		expect(log[0].details).toMatchObject({ bulk: true });
	});

	it('is for supervisors and admins only, and names what is wrong with the body', async () => {
		const t = await makeTeam();
		const a = await lib.createMaterial(actor(t.admin), boardValues());
		const asAssessor = await callHandler(route.POST, t.assessor, 'POST', '/api/v1/materials/verify', {
			body: { revisionIds: [a.revisionId] }
		});
		expect(asAssessor.status).toBe(403);
		const empty = await callHandler(route.POST, t.supervisor, 'POST', '/api/v1/materials/verify', {
			body: { revisionIds: [] }
		});
		expect(empty.status).toBe(400);
		expect(empty.json.issues).toEqual([{ path: 'revisionIds', message: 'choose at least one revision' }]);
		const bad = await callHandler(route.POST, t.supervisor, 'POST', '/api/v1/materials/verify', {
			body: { revisionIds: ['nope'] }
		});
		expect(bad.json.issues[0]).toEqual({ path: 'revisionIds.0', message: 'must be revision ids' });
	});
});
