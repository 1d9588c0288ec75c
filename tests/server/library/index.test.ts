import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent } from '../../factories';
import { boardValues, makeElement } from '../../factories-library';

// The material library module against a real PostgreSQL. Rules checked here are our own (revisions,
// roles, isolation: common practice, no source) unless a standard is named beside the check.
describe.skipIf(!hasDatabase)('material library', async () => {
	const lib = await import('../../../src/lib/server/library');
	const { analyseElement } = await import('../../../src/lib/physics');
	const actor = (m: { id: string; organisationId: string }) => ({
		userId: m.id,
		organisationId: m.organisationId
	});
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('shows λ to three decimals so the decimal points line up, keeping a fourth when needed', async () => {
		const { lambdaShown } = await import('../../../src/lib/library/value');
		expect([2, 1.35, 0.035, 0.0045, null].map(lambdaShown)).toEqual([
			'2.000',
			'1.350',
			'0.035',
			'0.0045',
			'–'
		]);
	});

	it('creates a material as revision 1, unverified, and lists it with search and filters', async () => {
		const t = await makeTeam();
		const v = boardValues({ name: 'Searchable wood fibre board' });
		const m = await lib.createMaterial(actor(t.assessor), v);
		expect(m).toMatchObject({
			code: v.code,
			revision: 1,
			status: 'unverified',
			lambda: 0.035,
			lambdaKind: 'declared',
			manufacturer: 'generic'
		});
		const found = await lib.listMaterials(t.org.id, { q: 'wood fibre', page: 1, pageSize: 50, sort: 'code' });
		expect(found.total).toBe(1);
		expect(Object.keys(found.items[0]).sort()).toEqual(
			[
				'id',
				'code',
				'revisionId',
				'revision',
				'name',
				'manufacturer',
				'category',
				'lambda',
				'lambdaKind',
				'resistance',
				'muDry',
				'muWet',
				'sd',
				'density',
				'specificHeat',
				'thicknessMinMm',
				'thicknessMaxMm',
				'source',
				'status'
			].sort()
		);
		expect(
			(await lib.listMaterials(t.org.id, { q: '', category: 'masonry', page: 1, pageSize: 50, sort: 'code' }))
				.total
		).toBe(0);
		expect(
			(await lib.listMaterials(t.org.id, { q: '', status: 'verified', page: 1, pageSize: 50, sort: 'code' }))
				.total
		).toBe(0);
		await lib.createMaterial(actor(t.assessor), boardValues({ lambda: 0.022 }));
		await lib.createMaterial(actor(t.assessor), boardValues({ lambda: 0.045 }));
		const byLambda = await lib.listMaterials(t.org.id, { q: '', page: 1, pageSize: 2, sort: '-lambda' });
		expect([byLambda.total, byLambda.items.map((i) => i.lambda)]).toEqual([3, [0.045, 0.035]]);
		const page2 = await lib.listMaterials(t.org.id, { q: '', page: 2, pageSize: 2, sort: '-lambda' });
		expect(page2.items.map((i) => i.lambda)).toEqual([0.022]);
		// A percent sign is searched for literally, not as a wildcard.
		expect((await lib.listMaterials(t.org.id, { q: '%', page: 1, pageSize: 50, sort: 'code' })).total).toBe(
			0
		);
	});

	it('refuses bad values field by field and asks to confirm unusual ones', async () => {
		const t = await makeTeam();
		await expect(lib.createMaterial(actor(t.assessor), boardValues({ lambda: -0.04 }))).rejects.toMatchObject(
			{
				status: 400,
				issues: [{ field: 'lambda', message: 'must be greater than 0 W/(m·K)' }]
			}
		);
		await expect(
			lib.createMaterial(actor(t.assessor), boardValues({ thicknessMinMm: 200, thicknessMaxMm: 100 }))
		).rejects.toMatchObject({
			issues: [{ field: 'thicknessMaxMm', message: 'thickness range max below min' }]
		});
		await expect(lib.createMaterial(actor(t.assessor), boardValues({ name: '=1+1' }))).rejects.toMatchObject({
			issues: [{ field: 'name' }]
		});
		// λ missing with its kind given: only the root cause, not a second error on the kind
		await expect(lib.createMaterial(actor(t.assessor), boardValues({ lambda: null }))).rejects.toMatchObject({
			status: 400,
			issues: [{ field: 'lambda', message: 'give λ or a fixed thermal resistance' }]
		});
		// a kind of λ beside a fixed resistance is its own fault
		await expect(
			lib.createMaterial(actor(t.assessor), boardValues({ lambda: null, resistance: 0.18 }))
		).rejects.toMatchObject({
			issues: [{ field: 'lambdaKind', message: 'applies only when λ is given' }]
		});
		// λ 0.35 is far above what insulation has (ISO 10456:2007 Table 3 range, from memory): a warning.
		const odd = boardValues({ lambda: 0.35 });
		await expect(lib.createMaterial(actor(t.assessor), odd)).rejects.toMatchObject({
			status: 422,
			warnings: [{ field: 'lambda' }]
		});
		expect((await lib.createMaterial(actor(t.assessor), odd, { confirmWarnings: true })).lambda).toBe(0.35);
		await expect(lib.createMaterial(actor(t.assessor), odd, { confirmWarnings: true })).rejects.toMatchObject(
			{ status: 409 }
		);
	});

	it('a change of value is a new revision; the old revision is kept and cannot be edited', async () => {
		const t = await makeTeam();
		const m = await lib.createMaterial(actor(t.assessor), boardValues());
		// Same values (the code is the material's and cannot change): no new revision.
		expect((await lib.updateMaterial(actor(t.assessor), m.id, boardValues())).outcome).toBe('unchanged');
		const r = await lib.updateMaterial(actor(t.assessor), m.id, { ...boardValues(), lambda: 0.032 });
		expect(r.outcome).toBe('changed');
		expect(r.changes).toEqual([{ field: 'lambda', from: 0.035, to: 0.032 }]);
		await lib.updateMaterial(actor(t.assessor), m.id, { ...boardValues(), lambda: 0.031, density: 32 });
		const full = await lib.getMaterial(t.org.id, m.id);
		expect(full!.revisions.map((x) => [x.revision, x.status])).toEqual([
			[3, 'unverified'],
			[2, 'superseded'],
			[1, 'superseded']
		]);
		// The database refuses to change a revision's values, and to delete one by itself.
		await expect(
			tdb()('material_revisions').where({ id: m.revisionId }).update({ lambda: 0.03 })
		).rejects.toThrow(/never change/);
		await expect(tdb()('material_revisions').where({ id: m.revisionId }).delete()).rejects.toThrow(
			/are kept/
		);
		await expect(
			lib.updateMaterial(
				actor(t.assessor),
				m.id,
				{ ...boardValues(), lambda: 0.03 },
				{ expectedRevisionId: m.revisionId }
			)
		).rejects.toMatchObject({ status: 409 });
	});

	it('supervisors verify and supersede; nobody verifies their own revision', async () => {
		const t = await makeTeam();
		const m = await lib.createMaterial(actor(t.admin), boardValues());
		await expect(lib.setMaterialStatus(actor(t.admin), m.id, 'verify')).rejects.toMatchObject({
			status: 403
		});
		const v = await lib.setMaterialStatus(actor(t.supervisor), m.id, 'verify');
		expect(v.status).toBe('verified');
		expect((await lib.getMaterial(t.org.id, m.id))!.verifiedBy?.id).toBe(t.supervisor.id);
		await expect(lib.setMaterialStatus(actor(t.supervisor), m.id, 'verify')).rejects.toMatchObject({
			status: 409
		});
		expect((await lib.setMaterialStatus(actor(t.admin), m.id, 'supersede')).status).toBe('superseded');
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'material' })
			.pluck('action');
		expect(log.sort()).toEqual(['create', 'supersede', 'verify']);
	});

	it('the API checks roles and never shows another organisation', async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		const m = await lib.createMaterial(actor(a.assessor), boardValues());
		const item = await import('../../../src/routes/api/v1/materials/[materialId=uuid]/+server');
		const status = await import('../../../src/routes/api/v1/materials/[materialId=uuid]/status/+server');
		const ev = (member: typeof a.assessor, method = 'GET', body?: unknown) => ({
			...fakeEvent(member, `/api/v1/materials/${m.id}`),
			params: { materialId: m.id },
			request: new Request('http://127.0.0.1/x', {
				method,
				body: body ? JSON.stringify(body) : undefined,
				headers: { 'content-type': 'application/json' }
			})
		});
		expect((await item.GET(ev(a.supervisor) as never)).status).toBe(200);
		await expect(item.GET(ev(b.admin) as never)).rejects.toMatchObject({ status: 404 });
		const put = await item.PUT(ev(b.admin, 'PUT', boardValues()) as never);
		expect(put.status).toBe(404);
		expect(await put.text()).not.toContain(m.id);
		await expect(status.POST(ev(a.assessor, 'POST', { action: 'verify' }) as never)).rejects.toMatchObject({
			status: 403
		});
		expect((await status.POST(ev(b.admin, 'POST', { action: 'verify' }) as never)).status).toBe(404);
		expect(
			(await lib.listMaterials(b.org.id, { q: m.code, page: 1, pageSize: 50, sort: 'code' })).total
		).toBe(0);
		expect(await lib.getCurrentRevision(b.org.id, m.id)).toBeNull();
		expect(await lib.getRevision(b.org.id, m.revisionId)).toBeNull();
	});

	it('an issued calculation keeps its values after the material changes; the update is explicit', async () => {
		const t = await makeTeam();
		const m = await lib.createMaterial(actor(t.assessor), boardValues({ lambda: 0.04 }));
		const buildUp = {
			layers: [
				{
					name: m.name,
					thicknessMm: 100,
					lambda: 0.04,
					mu: 1,
					materialId: m.id,
					materialRevisionId: m.revisionId,
					materialCode: m.code
				}
			]
		};
		const { elementId } = await makeElement(t.org.id, buildUp);
		const other = await makeTeam();
		await makeElement(other.org.id, buildUp); // another organisation's element: never listed
		// ISO 6946:2017 Table 7: Rsi 0.13, Rse 0.04 (horizontal heat flow). R = 0.13 + 0.100/0.04 + 0.04 = 2.67.
		const before = analyseElement({ heatFlow: 'horizontal', layers: buildUp.layers });
		expect(before.uValue).toBeCloseTo(1 / 2.67, 6);
		expect(await lib.findNewerRevisions(t.org.id, buildUp)).toEqual([]);

		await lib.updateMaterial(actor(t.assessor), m.id, { ...boardValues({ lambda: 0.032 }) });
		const stored = await tdb()('elements').where({ id: elementId }).first('build_up');
		expect(stored.build_up).toEqual(buildUp); // the element still holds the values it was calculated with
		expect(analyseElement({ heatFlow: 'horizontal', layers: stored.build_up.layers }).uValue).toBe(
			before.uValue
		);

		const updates = await lib.findNewerRevisions(t.org.id, stored.build_up);
		expect(updates).toHaveLength(1);
		expect(updates[0]).toMatchObject({
			layerIndex: 0,
			materialId: m.id,
			fromRevisionId: m.revisionId,
			fromRevision: 1,
			toRevision: 2
		});
		expect(updates[0].changes).toContainEqual({ field: 'lambda', from: 0.04, to: 0.032 });
		expect(await lib.findNewerRevisions(other.org.id, stored.build_up)).toEqual([]);
		const next = lib.applyRevisionUpdate(stored.build_up, updates);
		expect(next.layers[0]).toMatchObject({
			lambda: 0.032,
			materialRevisionId: updates[0].toRevisionId,
			thicknessMm: 100
		});
		expect(stored.build_up.layers[0].lambda).toBe(0.04); // pure: the input is untouched
		// R = 0.13 + 0.100/0.032 + 0.04 = 3.295 (ISO 6946:2017 Table 7 surface resistances)
		expect(analyseElement({ heatFlow: 'horizontal', layers: next.layers }).uValue).toBeCloseTo(1 / 3.295, 6);
		expect(() => lib.applyRevisionUpdate(next, updates)).toThrow(/no longer points/);

		const uses = await lib.listElementsUsingMaterial(t.org.id, m.id);
		expect(uses).toHaveLength(1);
		expect(uses[0]).toMatchObject({
			id: elementId,
			outdated: true,
			layers: [{ layerIndex: 0, revision: 1 }]
		});
	});
});
