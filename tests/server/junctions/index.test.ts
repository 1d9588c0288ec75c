import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, callHandler } from '../../factories';
import { asMember, ref, WALL, makeClimate } from '../../factories-dwellings';

// Junctions of a dwelling through the service and the JSON API: the server builds and computes the
// result itself, versions refuse stale saves, signed-off dwellings refuse changes until reopened, and
// another organisation's ids answer 404 (our own rules: scoping, roles, optimistic locking — common
// practice, no source). Physics of the result is checked in tests/junctions and tests/physics.
describe.skipIf(!hasDatabase)('junctions', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const junctions = await import('../../../src/lib/server/junctions');
	const list = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/junctions/+server');
	const one = await import('../../../src/routes/api/v1/junctions/[junctionId=uuid]/+server');
	const calc = await import('../../../src/routes/api/v1/junctions/calculate/+server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const rows = async (dwellingId: string) =>
		Number((await tdb()('junctions').where({ dwelling_id: dwellingId }).count({ n: '*' }))[0].n);

	async function arrange() {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const climateId = await makeClimate(t.org.id);
		const d = await dwellings.createDwelling(m, { reference: ref('JN'), address: '1 Corner Row', climateId });
		const wall = await elements.createElement(m, d.id, WALL);
		return { t, m, d, wall };
	}
	const corner = (wallId: string, over: Record<string, unknown> = {}) => ({
		name: 'Front corners',
		type: 'external-corner',
		lengthM: 10.4,
		source: 'calculated',
		dimensionSystem: 'external',
		details: { mode: 'builder', elements: { a: wallId } },
		...over
	});
	const entered = {
		name: 'Lintels',
		type: 'window-head',
		lengthM: 6,
		source: 'entered',
		dimensionSystem: 'external',
		psiEntered: 0.3,
		psiSource: 'Default table value, assumed'
	};

	it('creates a calculated junction from the dwelling’s wall; the server computes and logs it', async () => {
		const { t, d, wall } = await arrange();
		const res = await callHandler(list.POST, t.assessor, 'POST', `/api/v1/dwellings/${d.id}/junctions`, {
			params: { dwellingId: d.id },
			body: corner(wall.id)
		});
		expect(res.status).toBe(201);
		const j = res.json;
		expect(j).toMatchObject({
			name: 'Front corners',
			source: 'calculated',
			version: 1,
			dimensionSystem: 'external'
		});
		expect(j.lastResult.psi).toBeLessThan(0); // an external corner on external dimensions
		expect(j.lastResult.surface.critical).not.toBeNull(); // the dwelling's climate
		expect(j.lastResult.elements).toEqual([{ id: wall.id, name: WALL.name, version: 1 }]);
		expect(j.model.regions.length).toBeGreaterThan(4);
		expect(j.engineVersion).toMatch(/^\d+\.\d+\.\d+$/);
		const log = await tdb()('activity_log')
			.where({ entity: 'junction', entity_id: j.id, action: 'create' })
			.first();
		expect(log.details).toMatchObject({ dwellingId: d.id, name: 'Front corners', psi: j.lastResult.psi });
		const got = await callHandler(list.GET, t.supervisor, 'GET', `/api/v1/dwellings/${d.id}/junctions`, {
			params: { dwellingId: d.id }
		});
		expect(got.json.items).toEqual([
			expect.objectContaining({ id: j.id, psi: j.lastResult.psi, lengthM: 10.4 })
		]);
	});

	it('stores an entered ψ with its source; lists it and sums ψ·L', async () => {
		const { t, m, d, wall } = await arrange();
		const a = await junctions.createJunction(m, d.id, entered);
		expect(a).toMatchObject({
			psiEntered: 0.3,
			psiSource: 'Default table value, assumed',
			lastResult: null,
			model: null
		});
		const b = await junctions.createJunction(m, d.id, corner(wall.id));
		const totals = await junctions.junctionTotals(t.org.id, d.id);
		expect(totals.count).toBe(2);
		expect(totals.sumPsiL).toBeCloseTo(0.3 * 6 + b.lastResult!.psi! * 10.4, 10);
		expect(totals.items.find((i) => i.id === a.id)).toMatchObject({
			source: 'entered',
			psi: 0.3,
			psiSource: 'Default table value, assumed'
		});
	});

	it('updates with the loaded version, refuses a stale one with 409, deletes with ?version', async () => {
		const { t, d, wall } = await arrange();
		const j = await junctions.createJunction(asMember(t.assessor), d.id, corner(wall.id));
		const put = (version: number, body: Record<string, unknown>) =>
			callHandler(one.PUT, t.assessor, 'PUT', `/api/v1/junctions/${j.id}`, {
				params: { junctionId: j.id },
				body: { ...body, version }
			});
		const gap = corner(wall.id, {
			details: { mode: 'builder', elements: { a: wall.id }, gap: { widthMm: 40, lambda: 0.5 } }
		});
		const ok = await put(1, gap);
		expect(ok.status).toBe(200);
		expect(ok.json.version).toBe(2);
		expect(ok.json.lastResult.psi).toBeGreaterThan(j.lastResult!.psi!); // a gap in the insulation raises ψ
		const stale = await put(1, corner(wall.id, { name: 'Stale' }));
		expect(stale.status).toBe(409);
		expect(stale.json.currentVersion).toBe(2);
		expect((await junctions.getJunction(t.org.id, j.id))!.name).toBe('Front corners');
		const staleDelete = await callHandler(
			one.DELETE,
			t.assessor,
			'DELETE',
			`/api/v1/junctions/${j.id}?version=1`,
			{
				params: { junctionId: j.id }
			}
		);
		expect(staleDelete.status).toBe(409);
		const del = await callHandler(one.DELETE, t.assessor, 'DELETE', `/api/v1/junctions/${j.id}?version=2`, {
			params: { junctionId: j.id }
		});
		expect(del.status).toBe(204);
		expect(await junctions.getJunction(t.org.id, j.id)).toBeNull();
		const actions = await tdb()('activity_log')
			.where({ entity: 'junction', entity_id: j.id })
			.orderBy('created_at')
			.pluck('action');
		expect(actions).toEqual(['create', 'update', 'delete']);
	});

	it('refuses changes to an accepted dwelling with reopen-required until it is reopened', async () => {
		const { t, m, d, wall } = await arrange();
		const j = await junctions.createJunction(m, d.id, entered);
		await tdb()('dwellings').where({ id: d.id }).update({ status: 'accepted' });
		const res = await callHandler(list.POST, t.assessor, 'POST', `/api/v1/dwellings/${d.id}/junctions`, {
			params: { dwellingId: d.id },
			body: corner(wall.id)
		});
		expect(res.status).toBe(409);
		expect(res.json.code).toBe('reopen-required');
		await expect(
			junctions.updateJunction(m, j.id, { ...entered, psiEntered: 0.2, version: 1 })
		).rejects.toMatchObject({
			status: 409,
			extra: expect.objectContaining({ code: 'reopen-required' })
		});
		await expect(junctions.deleteJunction(m, j.id, 1)).rejects.toMatchObject({ status: 409 });
		expect(await rows(d.id)).toBe(1);
		const version = (await dwellings.getDwelling(t.org.id, d.id))!.version;
		await dwellings.reopenDwelling(m, d.id, { reason: 'The corner detail was changed on site.', version });
		const after = await junctions.updateJunction(m, j.id, { ...entered, psiEntered: 0.2, version: 1 });
		expect(after.psiEntered).toBe(0.2);
	});

	it('answers 404 to another organisation and 403 to a supervisor who writes', async () => {
		const { t, m, d, wall } = await arrange();
		const j = await junctions.createJunction(m, d.id, entered);
		const other = await makeTeam();
		const get = await callHandler(one.GET, other.assessor, 'GET', `/api/v1/junctions/${j.id}`, {
			params: { junctionId: j.id }
		});
		expect(get.status).toBe(404);
		expect(get.text).not.toContain(j.id);
		const put = await callHandler(one.PUT, other.assessor, 'PUT', `/api/v1/junctions/${j.id}`, {
			params: { junctionId: j.id },
			body: { ...entered, version: 1 }
		});
		expect(put.status).toBe(404);
		const listed = await callHandler(list.GET, other.assessor, 'GET', `/api/v1/dwellings/${d.id}/junctions`, {
			params: { dwellingId: d.id }
		});
		expect(listed.status).toBe(404);
		const created = await callHandler(
			list.POST,
			other.assessor,
			'POST',
			`/api/v1/dwellings/${d.id}/junctions`,
			{
				params: { dwellingId: d.id },
				body: entered
			}
		);
		expect(created.status).toBe(404);
		// the other organisation's own dwelling may not name this dwelling's wall
		const theirs = await dwellings.createDwelling(asMember(other.assessor), { reference: ref('JN') });
		await expect(
			junctions.createJunction(asMember(other.assessor), theirs.id, corner(wall.id))
		).rejects.toMatchObject({
			status: 400,
			issues: [{ path: 'details.elements.a', message: 'is not an element of this dwelling' }]
		});
		const sup = await callHandler(list.POST, t.supervisor, 'POST', `/api/v1/dwellings/${d.id}/junctions`, {
			params: { dwellingId: d.id },
			body: entered
		});
		expect(sup.status).toBe(403);
	});

	it('answers bad input with 400 naming each field', async () => {
		const { t, d, wall } = await arrange();
		const post = (body: unknown) =>
			callHandler(list.POST, t.assessor, 'POST', `/api/v1/dwellings/${d.id}/junctions`, {
				params: { dwellingId: d.id },
				body
			});
		const cases: [unknown, string, RegExp][] = [
			[{ ...entered, lengthM: -1 }, 'lengthM', /> 0 m/],
			[{ ...entered, psiSource: '' }, 'psiSource', /name the source/],
			[{ ...entered, type: 'balcony' }, 'type', /must be one of/],
			[
				{ ...entered, dimensionSystem: 'metric' },
				'dimensionSystem',
				/internal, overall-internal or external/
			],
			[
				corner(wall.id, {
					details: { mode: 'builder', elements: { a: wall.id }, gap: { widthMm: 40, lambda: 0 } }
				}),
				'details.gap.lambda',
				/> 0/
			],
			[
				corner(wall.id, {
					type: 'other',
					details: { mode: 'free-form' },
					model: {
						regions: [{ x0: 0, x1: 10, y0: 0, y1: 10, lambda: 1 }],
						boundaries: [{ from: [0, 0], to: [0, 10], environment: 'nowhere' }],
						environments: { in: { temperature: 20, rs: 0.13 } }
					}
				}),
				'model.boundaries.0.environment',
				/not among the environments/
			],
			[corner(wall.id, { type: 'ground-floor' }), 'details.elements.b', /required/]
		];
		for (const [body, path, message] of cases) {
			const res = await post(body);
			expect(res.status, path).toBe(400);
			expect(res.json.issues, path).toContainEqual({ path, message: expect.stringMatching(message) });
		}
		expect(await rows(d.id)).toBe(0);
	});

	it('calculates a model statelessly: the result, nothing stored, bad models refused by field', async () => {
		const { t } = await arrange();
		const before = await tdb()('junctions').count({ n: '*' });
		const model = {
			regions: [{ x0: 0, x1: 200, y0: 0, y1: 1000, lambda: 0.04 }],
			boundaries: [
				{ from: [0, 0], to: [0, 1000], environment: 'out' },
				{ from: [200, 0], to: [200, 1000], environment: 'in' }
			],
			environments: { in: { temperature: 20, rs: 0.13 }, out: { temperature: 0, rs: 0.04 } },
			flanks: [{ uValue: 1 / (0.13 + 5 + 0.04), lengthMm: 1000 }]
		};
		const res = await callHandler(calc.POST, t.assessor, 'POST', '/api/v1/junctions/calculate', {
			body: model
		});
		expect(res.status).toBe(200);
		// a plane wall: L2D = U·l (ISO 6946 series resistances) and ψ = 0
		expect(res.json.couplingCoefficient).toBeCloseTo(1 / 5.17, 6);
		expect(Math.abs(res.json.psi)).toBeLessThan(1e-6);
		expect(res.json.cautions.length).toBeGreaterThan(0);
		expect(await tdb()('junctions').count({ n: '*' })).toEqual(before);
		const bad = await callHandler(calc.POST, t.assessor, 'POST', '/api/v1/junctions/calculate', {
			body: { ...model, regions: [{ ...model.regions[0], lambda: 'x' }] }
		});
		expect(bad.status).toBe(400);
		expect(bad.json.issues[0]).toMatchObject({ path: 'regions.0.lambda' });
		const anon = await callHandler(calc.POST, null, 'POST', '/api/v1/junctions/calculate', { body: model });
		expect(anon.status).toBe(401);
	});
});
