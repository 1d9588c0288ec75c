import { describe, it, expect, afterAll } from 'vitest';
import {
	hasDatabase,
	makeTeam,
	makeMember,
	tdb,
	fakeEvent,
	asMember,
	callHandler as call
} from '../../factories';
import type { Role } from '../../../src/lib/members/roles';

// Templates: who may save, change and delete them is Envelo's own rule (common practice, no source).

/** A cavity wall: plaster, aircrete, mineral wool, brick (generic values, common practice, no source). */
const WALL = {
	layers: [
		{ name: 'Gypsum plaster', thicknessMm: 13, lambda: 0.4, mu: 10 },
		{ name: 'Aircrete block', thicknessMm: 100, lambda: 0.15, mu: 6 },
		{ name: 'Mineral wool', thicknessMm: 100, lambda: 0.035, mu: 1, materialCode: 'IN-MW-035' },
		{ name: 'Clay brick', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
	]
};

describe.skipIf(!hasDatabase)('templates', async () => {
	const templates = await import('../../../src/lib/server/templates');
	const list = await import('../../../src/routes/api/v1/templates/+server');
	const one = await import('../../../src/routes/api/v1/templates/[templateId=uuid]/+server');
	const { templateU } = await import('../../../src/routes/(app)/templates/_u-value');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('lets assessors and admins save a template, not supervisors', async () => {
		const t = await makeTeam();
		const body = { name: 'Cavity wall', kind: 'external-wall', description: 'Full fill', buildUp: WALL };
		const r = await call(list.POST, t.assessor, 'POST', '/api/v1/templates', { body });
		expect(r.status).toBe(201);
		expect(r.json).toMatchObject({
			name: 'Cavity wall',
			kind: 'external-wall',
			createdBy: { id: t.assessor.id }
		});
		expect(r.json.buildUp.layers[2].materialCode).toBe('IN-MW-035');
		expect(
			(await call(list.POST, t.admin, 'POST', '/api/v1/templates', { body: { ...body, name: 'Admin wall' } }))
				.status
		).toBe(201);
		expect(
			(await call(list.POST, t.supervisor, 'POST', '/api/v1/templates', { body: { ...body, name: 'No' } }))
				.status
		).toBe(403);
		const dup = await call(list.POST, t.admin, 'POST', '/api/v1/templates', { body });
		expect(dup.status).toBe(409);
	});

	it('filters by kind and text, within the organisation', async () => {
		const t = await makeTeam();
		const other = await makeTeam();
		const m = asMember(t.admin);
		await templates.createTemplate(m, {
			name: 'Wall one',
			kind: 'external-wall',
			description: 'brick',
			buildUp: WALL
		});
		await templates.createTemplate(m, { name: 'Loft one', kind: 'pitched-roof-ceiling', buildUp: WALL });
		await templates.createTemplate(asMember(other.admin), {
			name: 'Elsewhere',
			kind: 'external-wall',
			buildUp: WALL
		});
		const walls = await call(list.GET, t.supervisor, 'GET', '/api/v1/templates?kind=external-wall');
		expect(walls.json.items.map((x: { name: string }) => x.name)).toEqual(['Wall one']);
		const q = await call(list.GET, t.supervisor, 'GET', '/api/v1/templates?q=BRICK');
		expect(q.json.items.map((x: { name: string }) => x.name)).toEqual(['Wall one']);
		expect((await call(list.GET, t.supervisor, 'GET', '/api/v1/templates')).json.items).toHaveLength(2);
		expect((await call(list.GET, t.supervisor, 'GET', '/api/v1/templates?kind=attic')).status).toBe(400);
	});

	it('validates the build-up field by field, and refuses windows and doors', async () => {
		const t = await makeTeam();
		const bad = {
			name: 'Bad',
			kind: 'window',
			buildUp: {
				layers: [
					{ name: 'Board', thicknessMm: -5, lambda: 0.2 },
					{ name: 'Gap', thicknessMm: 20 }
				]
			}
		};
		const r = await call(list.POST, t.admin, 'POST', '/api/v1/templates', { body: bad });
		expect(r.status).toBe(400);
		const paths = r.json.issues.map((i: { path: string }) => i.path);
		expect(paths).toEqual(
			expect.arrayContaining(['kind', 'buildUp.layers.0.thicknessMm', 'buildUp.layers.1.lambda'])
		);
		const none = await call(list.POST, t.admin, 'POST', '/api/v1/templates', {
			body: { name: 'None', kind: 'flat-roof', buildUp: { layers: [] } }
		});
		expect(none.json.issues).toContainEqual({
			path: 'buildUp.layers',
			message: 'at least one layer is required'
		});
		expect(await tdb()('templates').where({ organisation_id: t.org.id })).toHaveLength(0);
	});

	it('lets its author or an admin change or delete it, not another assessor', async () => {
		const t = await makeTeam();
		const second = await makeMember(t.org.id, 'assessor');
		const mine = await templates.createTemplate(asMember(t.assessor), {
			name: 'Mine',
			kind: 'external-wall',
			buildUp: WALL
		});
		const params = { templateId: mine.id };
		const url = `/api/v1/templates/${mine.id}`;
		const denied = await call(one.PATCH, second, 'PATCH', url, {
			params,
			body: { name: 'Taken over', version: 1 }
		});
		expect(denied.status).toBe(403);
		expect((await call(one.DELETE, second, 'DELETE', `${url}?version=1`, { params })).status).toBe(403);
		expect(
			(await call(one.PATCH, t.supervisor, 'PATCH', url, { params, body: { name: 'x', version: 1 } })).status
		).toBe(403);
		const own = await call(one.PATCH, t.assessor, 'PATCH', url, {
			params,
			body: { description: 'Updated', version: 1 }
		});
		expect(own.status).toBe(200);
		expect(own.json).toMatchObject({ name: 'Mine', description: 'Updated' });
		const badPatch = await call(one.PATCH, t.admin, 'PATCH', url, {
			params,
			body: { buildUp: { layers: [{ name: 'x' }] }, version: 2 }
		});
		expect(badPatch.status).toBe(400);
		expect(
			(
				await call(one.PATCH, t.admin, 'PATCH', url, {
					params,
					body: { name: 'Renamed by admin', version: 2 }
				})
			).json.name
		).toBe('Renamed by admin');
		expect((await call(one.DELETE, t.admin, 'DELETE', `${url}?version=3`, { params })).status).toBe(204);
		expect(await templates.getTemplate(t.org.id, mine.id)).toBeNull();
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'template' })
			.orderBy('id');
		expect(log.map((r) => r.action)).toEqual(['create', 'update', 'update', 'delete']);
	});

	it("gives another organisation's member 404 everywhere, without echoing the id", async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		const tpl = await templates.createTemplate(asMember(a.admin), {
			name: 'Private build-up',
			kind: 'flat-roof',
			buildUp: WALL
		});
		const params = { templateId: tpl.id };
		const url = `/api/v1/templates/${tpl.id}`;
		for (const [h, method, body] of [
			[one.GET, 'GET', undefined],
			[one.PATCH, 'PATCH', {}],
			[one.PUT, 'PUT', { name: 'Mine' }],
			[one.DELETE, 'DELETE', undefined]
		] as const) {
			const r = await call(h, b.admin, method, url, { params, body });
			expect(r.status, method).toBe(404);
			expect(r.text).not.toContain(tpl.id);
			expect(r.text).not.toContain('Private');
		}
	});

	it('shows a guide U-value that matches a hand calculation with the standard surface resistances', () => {
		// ISO 6946:2017, Table 7 (from memory): Rsi 0.13, Rse 0.04 m²·K/W for horizontal heat flow.
		// R = 0.13 + 0.013/0.40 + 0.100/0.15 + 0.100/0.035 + 0.1025/0.77 + 0.04 = 3.8594 m²·K/W → U = 0.2591
		const hand = 1 / (0.13 + 0.013 / 0.4 + 0.1 / 0.15 + 0.1 / 0.035 + 0.1025 / 0.77 + 0.04);
		const r = templateU('external-wall', WALL);
		expect(r.problem).toBeNull();
		expect(r.u).toBeCloseTo(hand, 3);
		expect(r.rounded).toBe(0.26);
		const broken = templateU('external-wall', { layers: [{ name: 'x', thicknessMm: 10 } as never] });
		expect(broken.u).toBeNull();
		expect(broken.problem).toMatch(/layers\.0\.lambda/);
	});

	it('keeps every field of an element\u2019s build-up: one schema for both, and a template round-trips each field', async () => {
		const { storedBuildUpSchema } = await import('../../../src/lib/dwellings/schema');
		const { templateInputSchema } = await import('../../../src/lib/templates/schema');
		// The template's build-up is checked by the element's own schema, not a copy of it.
		expect(templateInputSchema.shape.buildUp).toBe(storedBuildUpSchema);
		const t = await makeTeam();
		// Every field an element's build-up stores, each with a value other than its default (invented
		// values; only their survival is tested).
		const buildUp = {
			rsi: 0.1,
			rse: 0.04,
			surfaceConditions: { internalEmissivity: 0.2, externalEmissivity: 0.85, windSpeed: 6 },
			ground: {
				perimeterM: 32,
				areaM2: 60,
				groundLambda: 1.5,
				wallThicknessM: 0.3,
				suspended: {
					heightM: 0.3,
					underfloorWallU: 1.7,
					openingsPerPerimeter: 0.003,
					windSpeed: 5,
					windShielding: 'average'
				},
				// (a floor has one type; the schema stores each, the engine refuses more than one)
				basement: {
					kind: 'unheated',
					depthM: 2.5,
					wallR: 0.2,
					floorR: 0.1,
					wallAboveGroundHeightM: 0.5,
					wallAboveGroundU: 1.5,
					airChangeRate: 0.3,
					volumeM3: 250
				},
				edge: {
					orientation: 'vertical',
					widthM: 0.6,
					insulationThicknessM: 0.05,
					insulationR: 1.5,
					insulationLambda: 0.033
				}
			},
			roofSpace: 'tiles-with-felt-or-boards',
			unheatedSpace: {
				internalAreaM2: 12,
				externalElements: [{ name: 'Garage door', areaM2: 6, uValue: 3 }],
				airChangeRate: 2,
				airtightness: 'some-open-joints',
				volumeM3: 60
			},
			inclinationDeg: 35,
			layers: [
				{
					name: 'Mineral wool between joists',
					thicknessMm: 100,
					lambda: 0.035,
					mu: 1,
					airGapLevel: 1,
					bridge: { lambda: 0.13, widthMm: 47, centresMm: 600, name: 'Joist', mu: 20 },
					bridgeGeometry: { widthMm: 47, centresMm: 600 },
					materialId: '00000000-0000-4000-8000-000000000001',
					materialRevisionId: '00000000-0000-4000-8000-000000000002',
					materialCode: 'IN-MW-035',
					density: 30,
					specificHeat: 1030
				},
				{
					name: 'Board on fixings',
					thicknessMm: 50,
					lambda: 0.022,
					sd: 2,
					fasteners: { lambda: 50, areaMm2: 12.6, perM2: 4, penetrationMm: 50 },
					fastenerDiameterMm: 4
				},
				{ name: 'Cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 1000, mu: 1 },
				{ name: 'Membrane', thicknessMm: 0.2, resistance: 0 }
			]
		};
		// Every key of the element schema appears in the sample, so a new field cannot be forgotten here.
		expect(Object.keys(buildUp).sort()).toEqual(Object.keys(storedBuildUpSchema.shape).sort());
		const body = { name: 'Every field', kind: 'ground-floor', buildUp };
		const created = await call(list.POST, t.assessor, 'POST', '/api/v1/templates', { body });
		expect(created.status).toBe(201);
		const id = (created.json as { id: string }).id;
		const read = await call(one.GET, t.assessor, 'GET', `/api/v1/templates/${id}`, {
			params: { templateId: id }
		});
		const back = (read.json as { buildUp: typeof buildUp }).buildUp;
		expect(back).toEqual(storedBuildUpSchema.parse(buildUp));
		for (const [i, layer] of buildUp.layers.entries()) {
			for (const [field, value] of Object.entries(layer)) {
				expect((back.layers[i] as Record<string, unknown>)[field], `layer ${i + 1}, ${field}`).toEqual(value);
			}
		}
		expect(back.ground).toEqual(buildUp.ground);
		expect(back.roofSpace).toBe('tiles-with-felt-or-boards');
		expect(back.unheatedSpace).toEqual(buildUp.unheatedSpace);
		expect(back.surfaceConditions).toEqual(buildUp.surfaceConditions);
	});
});
