import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent } from '../../factories';
import { asMember, makeClimate, makeLimitTable, ref, WALL } from '../../factories-dwellings';

// Server modules and API handlers against a real PostgreSQL. The expected U-value is worked by hand from
// ISO 6946:2017 (RT = Rsi + Σd/λ + Rse with Rsi 0.13 and Rse 0.04 m²·K/W for horizontal heat flow, Table 7);
// the rest are our own rules (scoping, roles, locking: common practice, no source).
describe.skipIf(!hasDatabase)('dwellings and elements', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const { ConflictError, NotFoundError, ValidationError } = await import('../../../src/lib/server/errors');
	const calculate = await import('../../../src/routes/api/v1/calculate/+server');
	const list = await import('../../../src/routes/api/v1/dwellings/+server');
	const one = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/+server');
	const els = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/elements/+server');
	const el = await import('../../../src/routes/api/v1/elements/[elementId=uuid]/+server');
	const copy = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/copy/+server');
	const openapi = await import('../../../src/routes/api/v1/openapi.json/+server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	type M = Parameters<typeof fakeEvent>[0];
	const call = async (
		handler: (e: never) => Response | Promise<Response>,
		member: M,
		path: string,
		init: { method?: string; body?: unknown; params?: Record<string, string> } = {}
	) => {
		const ev = fakeEvent(member, path) as Record<string, unknown>;
		ev.request = new Request(`http://127.0.0.1${path}`, {
			method: init.method ?? 'GET',
			body: init.body === undefined ? undefined : JSON.stringify(init.body),
			headers: { 'content-type': 'application/json' }
		});
		ev.params = init.params ?? {};
		try {
			return await handler(ev as never);
		} catch (e) {
			const s = (e as { status?: number }).status;
			if (typeof s === 'number') return new Response(JSON.stringify(e), { status: s });
			throw e;
		}
	};

	// 12.5/0.25 + 100/0.04 + 100/0.5 mm → 0.05 + 2.5 + 0.2 = 2.75; RT = 0.13 + 2.75 + 0.04 = 2.92 m²·K/W.
	const WALL_U = 1 / 2.92;

	it('creates a dwelling and an element; the server computes U (ISO 6946 worked by hand)', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), address: '1 Test Row' });
		expect(d.assessorId).toBe(t.assessor.id);
		const e = await elements.createElement(m, d.id, WALL);
		expect(e.heatFlow).toBe('horizontal');
		expect(e.lastResult!.uValue).toBeCloseTo(WALL_U, 6);
		expect(e.lastResult!.uValueRounded).toBe(0.34);
		expect(e.engineVersion).toBeTruthy();
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'element', entity_id: e.id })
			.first();
		expect(log.action).toBe('create');
	});

	it('judges against the default limit table and sums ΣU·A', async () => {
		const t = await makeTeam();
		await makeLimitTable(t.org.id, { 'external-wall': 0.3, window: 1.6 });
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		await elements.createElement(m, d.id, WALL);
		await elements.createElement(m, d.id, {
			name: 'Windows',
			kind: 'window',
			area: 5,
			givenU: 1.4,
			givenUSource: 'declared'
		});
		const o = (await dwellings.getDwellingOverview(t.org.id, d.id))!;
		const wall = o.elements.find((x) => x.kind === 'external-wall')!;
		expect(wall.pass).toBe(false); // 0.34 > 0.30
		expect(o.elements.find((x) => x.kind === 'window')!.pass).toBe(true);
		expect(o.totals.sumUA).toBeCloseTo(WALL_U * 20 + 1.4 * 5, 6);
		expect(o.totals.meanU).toBeCloseTo((WALL_U * 20 + 1.4 * 5) / 25, 6);
		expect(o.totals.failing).toBe(1);
	});

	it('validation errors name the field and write nothing', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		const bad = { ...WALL, buildUp: { layers: [{ name: 'x', thicknessMm: -5, lambda: 0.04 }] } };
		const err = await elements.createElement(m, d.id, bad).catch((e) => e);
		expect(err).toBeInstanceOf(ValidationError);
		expect(err.issues).toContainEqual({ path: 'buildUp.layers.0.thicknessMm', message: 'must be > 0' });
		const res = await call(els.POST, t.assessor, `/api/v1/dwellings/${d.id}/elements`, {
			method: 'POST',
			body: { ...WALL, area: 'big' },
			params: { dwellingId: d.id }
		});
		expect(res.status).toBe(400);
		expect((await res.json()).issues[0].path).toBe('area');
		const [{ n }] = await tdb()('elements').where({ dwelling_id: d.id }).count({ n: '*' });
		expect(Number(n)).toBe(0);
		// A window needs its given U and its source.
		const w = await elements.createElement(m, d.id, { name: 'W', kind: 'window', area: 2 }).catch((e) => e);
		expect(w.issues.map((i: { path: string }) => i.path)).toEqual(['givenU', 'givenUSource']);
		// The reference is unique in the organisation.
		const dup = await dwellings.createDwelling(m, { reference: d.reference }).catch((e) => e);
		expect(dup.issues[0].path).toBe('reference');
	});

	it('a climate brings the moisture checks; a missing μ is reported per layer', async () => {
		const t = await makeTeam();
		const climateId = await makeClimate(t.org.id);
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), climateId });
		const e = await elements.createElement(m, d.id, WALL);
		expect(e.lastResult!.condensation).toBeDefined();
		expect(e.lastResult!.surface).toBeDefined();
		const noMu = { ...WALL, buildUp: { layers: [{ name: 'Board', thicknessMm: 12, lambda: 0.2 }] } };
		const err = await elements.createElement(m, d.id, noMu).catch((x) => x);
		expect(err.issues).toContainEqual({
			path: 'buildUp.layers.0.mu',
			message: 'give μ or sd for the condensation check'
		});
	});

	it('optimistic locking: a stale version gets 409 and changes nothing', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		const e = await elements.createElement(m, d.id, WALL);
		const v2 = await elements.updateElement(m, e.id, { ...WALL, area: 25, version: e.version });
		expect(v2.version).toBe(e.version + 1);
		const stale = await elements
			.updateElement(m, e.id, { ...WALL, area: 99, version: e.version })
			.catch((x) => x);
		expect(stale).toBeInstanceOf(ConflictError);
		expect((await elements.getElement(t.org.id, e.id))!.area).toBe(25);
		const res = await call(el.PUT, t.assessor, `/api/v1/elements/${e.id}`, {
			method: 'PUT',
			body: { ...WALL, version: 1 },
			params: { elementId: e.id }
		});
		expect(res.status).toBe(409);
		expect((await res.json()).message).toMatch(/changed by someone else/);
		const dv = await dwellings.updateDwelling(m, d.id, { address: 'New', version: d.version });
		expect(dv.address).toBe('New');
		await expect(
			dwellings.updateDwelling(m, d.id, { address: 'Old', version: d.version })
		).rejects.toBeInstanceOf(ConflictError);
	});

	it('copies a dwelling with its elements', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), address: 'Orig' });
		await elements.createElement(m, d.id, WALL);
		await elements.createElement(m, d.id, { ...WALL, name: 'Second' });
		const res = await call(copy.POST, t.assessor, `/api/v1/dwellings/${d.id}/copy`, {
			method: 'POST',
			body: { reference: ref('C') },
			params: { dwellingId: d.id }
		});
		expect(res.status).toBe(201);
		const c = await res.json();
		expect(c.address).toBe('Orig');
		expect(c.status).toBe('draft');
		const copied = await elements.listElementSummaries(t.org.id, c.id);
		expect(copied.map((x) => x.name)).toEqual(['Test wall', 'Second']);
		expect(copied[0].uValue).toBeCloseTo(WALL_U, 6);
	});

	it('roles: supervisors read but change nothing', async () => {
		const t = await makeTeam();
		const d = await dwellings.createDwelling(asMember(t.assessor), { reference: ref() });
		const get = await call(one.GET, t.supervisor, `/api/v1/dwellings/${d.id}`, {
			params: { dwellingId: d.id }
		});
		expect(get.status).toBe(200);
		const post = await call(list.POST, t.supervisor, '/api/v1/dwellings', {
			method: 'POST',
			body: { reference: ref() }
		});
		expect(post.status).toBe(403);
		const add = await call(els.POST, t.supervisor, `/api/v1/dwellings/${d.id}/elements`, {
			method: 'POST',
			body: WALL,
			params: { dwellingId: d.id }
		});
		expect(add.status).toBe(403);
		const anon = await call(list.GET, null, '/api/v1/dwellings');
		expect(anon.status).toBe(401);
	});

	it('organisation scoping: another organisation sees nothing and gets 404', async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		const d = await dwellings.createDwelling(asMember(a.assessor), { reference: ref('A') });
		const e = await elements.createElement(asMember(a.assessor), d.id, WALL);
		const listB = await (await call(list.GET, b.admin, '/api/v1/dwellings?status=all')).json();
		expect(listB.items.find((x: { id: string }) => x.id === d.id)).toBeUndefined();
		for (const [h, path, init] of [
			[one.GET, `/api/v1/dwellings/${d.id}`, { params: { dwellingId: d.id } }],
			[
				one.PATCH,
				`/api/v1/dwellings/${d.id}`,
				{ method: 'PATCH', body: { address: 'x', version: 1 }, params: { dwellingId: d.id } }
			],
			[els.GET, `/api/v1/dwellings/${d.id}/elements`, { params: { dwellingId: d.id } }],
			[
				els.POST,
				`/api/v1/dwellings/${d.id}/elements`,
				{ method: 'POST', body: WALL, params: { dwellingId: d.id } }
			],
			[el.GET, `/api/v1/elements/${e.id}`, { params: { elementId: e.id } }],
			[
				el.PUT,
				`/api/v1/elements/${e.id}`,
				{ method: 'PUT', body: { ...WALL, version: 1 }, params: { elementId: e.id } }
			],
			[
				copy.POST,
				`/api/v1/dwellings/${d.id}/copy`,
				{ method: 'POST', body: { reference: ref() }, params: { dwellingId: d.id } }
			]
		] as const) {
			const res = await call(h as never, b.assessor, path, init as never);
			expect(res.status, path).toBe(404);
			expect(await res.text()).not.toContain(d.reference);
		}
		const del = await call(el.DELETE, b.assessor, `/api/v1/elements/${e.id}?version=1`, {
			method: 'DELETE',
			params: { elementId: e.id }
		});
		expect(del.status).toBe(404);
		expect(await elements.getElement(a.org.id, e.id)).not.toBeNull();
		// A foreign climate or material revision cannot be named either.
		const foreignClimate = await makeClimate(a.org.id);
		const db2 = await dwellings.createDwelling(asMember(b.assessor), { reference: ref('B') });
		const bad = await elements
			.createElement(asMember(b.assessor), db2.id, { ...WALL, climateId: foreignClimate })
			.catch((x) => x);
		expect(bad.issues[0].path).toBe('climateId');
		await expect(dwellings.getDwellingOverview(b.org.id, d.id)).resolves.toBeNull();
		await expect(elements.deleteElement(asMember(b.assessor), e.id, 1)).rejects.toBeInstanceOf(NotFoundError);
	});

	it('lists with search, status filter, sort and pages', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		for (const r of ['Q-3', 'Q-1', 'Q-2'])
			await dwellings.createDwelling(m, { reference: r, address: `${r} Lane` });
		const arch = await dwellings.createDwelling(m, { reference: 'Q-9' });
		await dwellings.setDwellingArchived(m, arch.id, true, arch.version);
		const p = await dwellings.listDwellings(t.org.id, {
			q: 'q-',
			sort: 'reference',
			dir: 'asc',
			pageSize: '2'
		});
		expect(p.total).toBe(3);
		expect(p.items.map((x) => x.reference)).toEqual(['Q-1', 'Q-2']);
		const all = await dwellings.listDwellings(t.org.id, { status: 'all' });
		expect(all.total).toBe(4);
		const bad = await call(list.GET, t.assessor, '/api/v1/dwellings?sort=colour');
		expect(bad.status).toBe(400);
		expect((await bad.json()).issues[0].path).toBe('sort');
		// Archived dwellings refuse element changes.
		await expect(elements.createElement(m, arch.id, WALL)).rejects.toBeInstanceOf(ConflictError);
	});

	it('POST /calculate is stateless and validates; the OpenAPI document lists it', async () => {
		const t = await makeTeam();
		const res = await call(calculate.POST, t.supervisor, '/api/v1/calculate', {
			method: 'POST',
			body: { heatFlow: 'horizontal', layers: WALL.buildUp.layers }
		});
		expect(res.status).toBe(200);
		expect((await res.json()).uValue).toBeCloseTo(WALL_U, 6);
		const bad = await call(calculate.POST, t.supervisor, '/api/v1/calculate', {
			method: 'POST',
			body: { heatFlow: 'sideways', layers: [] }
		});
		expect(bad.status).toBe(400);
		const paths = (await bad.json()).issues.map((i: { path: string }) => i.path);
		expect(paths).toContain('heatFlow');
		const doc = await (await call(openapi.GET, t.assessor, '/api/v1/openapi.json')).json();
		expect(doc.openapi).toBe('3.1.0');
		expect(
			doc.paths['/api/v1/calculate'].post.requestBody.content['application/json'].schema.properties.layers
		).toBeDefined();
	});
});
