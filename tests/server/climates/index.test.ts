import { describe, it, expect, afterAll } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { randomUUID } from 'node:crypto';
import { hasDatabase, makeTeam, tdb, fakeEvent, asMember, callHandler as call } from '../../factories';
import type { Role } from '../../../src/lib/members/roles';

// The climate format and access rules are Envelo's own (common practice, no source). Figures in the
// fixtures are invented for the demo.

const FIXTURES = path.resolve('fixtures/climates');
const read = (name: string) => new Uint8Array(fs.readFileSync(path.join(FIXTURES, name)));

const months = (rh = 80) =>
	Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature: i - 2, relativeHumidity: rh }));

describe.skipIf(!hasDatabase)('climates', async () => {
	const climates = await import('../../../src/lib/server/climates');
	const { parseClimateCsv } = await import('../../../src/lib/server/climates/import');
	const { ConflictError } = await import('../../../src/lib/server/errors');
	const list = await import('../../../src/routes/api/v1/climates/+server');
	const one = await import('../../../src/routes/api/v1/climates/[climateId=uuid]/+server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	describe('CSV reading', () => {
		it('reads the demo files: comma with dots, and semicolon with decimal commas and month names', () => {
			const a = parseClimateCsv(read('demo-coastal-invented.csv'));
			expect(a.ok).toBe(true);
			if (!a.ok) return;
			expect(a.months).toHaveLength(12);
			expect(a.months[0]).toEqual({ month: 1, temperature: 5, relativeHumidity: 87 });
			expect(a.months[11]).toEqual({ month: 12, temperature: 6, relativeHumidity: 88 });
			const b = parseClimateCsv(read('demo-semicolon-decimal-comma-invented.csv'));
			expect(b.ok).toBe(true);
			if (!b.ok) return;
			expect(b.months[0]).toEqual({ month: 1, temperature: -0.5, relativeHumidity: 92 });
			expect(b.months[6].temperature).toBe(13);
		});

		const BAD: [string, RegExp][] = [
			['text-in-number.csv', /^line 7, relative_humidity: '1O5' is not a number$/],
			['duplicate-month.csv', /^line 6, month: month 4 appears twice \(first on line 5\)$/],
			['eleven-months.csv', /^11 months given, 12 needed \(missing: December\)$/],
			['thirteen-rows.csv', /13 months given, 12 needed/],
			['rh-out-of-range.csv', /^line 3, relative_humidity: 104 is outside 0–100 %$/],
			['rh-as-fraction.csv', /^line 4, relative_humidity: 0\.85 looks like a fraction/],
			['missing-column.csv', /^line 1: no 'relative_humidity' column/],
			['no-header.csv', /^line 1: the first row must be a header/],
			['short-row.csv', /^line 10: 2 values, 3 expected$/],
			['month-13.csv', /^line 11, month: '13' is not a month/],
			['empty.csv', /empty/],
			['header-only.csv', /header but no months/],
			['latin1.csv', /^The file is not UTF-8 text: line \d+ has the byte 0x[0-9A-F]{2}/]
		];
		for (const [file, message] of BAD) {
			it(`refuses ${file} with a specific message`, () => {
				const r = parseClimateCsv(read(`bad/${file}`));
				expect(r.ok).toBe(false);
				if (r.ok) return;
				expect(
					r.problems.map((p) => p.message).some((m) => message.test(m)),
					JSON.stringify(r.problems)
				).toBe(true);
			});
		}

		it('reports every bad line, not only the first', () => {
			const r = parseClimateCsv(read('bad/rh-out-of-range.csv'));
			expect(r.ok).toBe(false);
			if (r.ok) return;
			expect(r.problems.map((p) => p.line)).toEqual([3, 9]);
		});

		it('refuses a binary file and an over-large one', () => {
			const zip = parseClimateCsv(new Uint8Array([0x50, 0x4b, 0x03, 0x04, 0x00, 0x00]));
			expect(!zip.ok && zip.problems[0].message).toMatch(/spreadsheet workbook \(a zip file\), not CSV text/);
			const bin = parseClimateCsv(new Uint8Array([0x6d, 0x6f, 0x6e, 0x74, 0x68, 0x0a, 0x00, 0x01]));
			expect(!bin.ok && bin.problems[0]).toMatchObject({
				line: 2,
				message: expect.stringMatching(/binary file/)
			});
			const big = parseClimateCsv(new Uint8Array(70 * 1024).fill(0x41));
			expect(!big.ok && big.problems[0].message).toMatch(/must be under 64 KB/);
		});
	});

	describe('module', () => {
		it('creates, lists and reads within the organisation only, months in calendar order', async () => {
			const a = await makeTeam();
			const b = await makeTeam();
			const shuffled = [...months()].reverse();
			const c = await climates.createClimate(asMember(a.admin), {
				name: 'Hill farm',
				source: 'Test figures',
				months: shuffled
			});
			expect(c.months.map((m) => m.month)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
			expect((await climates.listClimates(a.org.id)).map((x) => x.id)).toEqual([c.id]);
			expect(await climates.listClimates(b.org.id)).toEqual([]);
			expect(await climates.getClimate(b.org.id, c.id)).toBeNull();
			const log = await tdb()('activity_log').where({
				organisation_id: a.org.id,
				entity: 'climate',
				entity_id: c.id
			});
			expect(log.map((r) => r.action)).toEqual(['create']);
		});

		it('refuses a second climate of the same name, and writes nothing', async () => {
			const a = await makeTeam();
			await climates.createClimate(asMember(a.admin), { name: 'Valley', source: 'Test', months: months() });
			await expect(
				climates.createClimate(asMember(a.admin), { name: 'Valley', source: 'Test', months: months() })
			).rejects.toThrow(ConflictError);
			expect(await tdb()('climates').where({ organisation_id: a.org.id })).toHaveLength(1);
			expect(
				await tdb()('activity_log').where({ organisation_id: a.org.id, entity: 'climate' })
			).toHaveLength(1);
		});

		it('refuses to delete a climate a dwelling or an element uses, and says which', async () => {
			const a = await makeTeam();
			const c = await climates.createClimate(asMember(a.admin), {
				name: 'Used',
				source: 'Test',
				months: months()
			});
			const dwellingId = randomUUID();
			await tdb()('dwellings').insert({
				id: dwellingId,
				organisation_id: a.org.id,
				reference: `D-${dwellingId.slice(0, 6)}`,
				climate_id: c.id
			});
			await expect(climates.deleteClimate(asMember(a.admin), c.id, c.version)).rejects.toThrow(
				/used by 1 dwelling;/
			);
			await tdb()('dwellings').where({ id: dwellingId }).update({ climate_id: null });
			await tdb()('elements').insert({
				organisation_id: a.org.id,
				dwelling_id: dwellingId,
				name: 'Wall',
				kind: 'external-wall',
				area: 10,
				heat_flow: 'horizontal',
				climate_id: c.id
			});
			await expect(climates.deleteClimate(asMember(a.admin), c.id, c.version)).rejects.toThrow(
				/used by 1 element;/
			);
			expect(await climates.getClimate(a.org.id, c.id)).not.toBeNull();
			await tdb()('elements').where({ dwelling_id: dwellingId }).update({ climate_id: null });
			expect(await climates.deleteClimate(asMember(a.admin), c.id, c.version)).toBe(true);
			expect(await climates.getClimate(a.org.id, c.id)).toBeNull();
		});
	});

	describe('API', () => {
		it('lets admins create (JSON or CSV) and everyone in the organisation read', async () => {
			const t = await makeTeam();
			const created = await call(list.POST, t.admin, 'POST', '/api/v1/climates', {
				body: { name: 'By JSON', source: 'Test', months: months() }
			});
			expect(created.status).toBe(201);
			const csv = fs.readFileSync(path.join(FIXTURES, 'demo-coastal-invented.csv'), 'utf8');
			const fromCsv = await call(
				list.POST,
				t.admin,
				'POST',
				'/api/v1/climates?name=By%20CSV&source=Invented&illustrative=true',
				{ csv }
			);
			expect(fromCsv.status).toBe(201);
			expect(fromCsv.json.illustrative).toBe(true);
			expect(fromCsv.json.months[3]).toEqual({ month: 4, temperature: 8.9, relativeHumidity: 80 });
			const inJson = await call(list.POST, t.admin, 'POST', '/api/v1/climates', {
				body: { name: 'CSV in JSON', source: 'Test', csv }
			});
			expect(inJson.status).toBe(201);
			for (const who of [t.assessor, t.supervisor]) {
				const r = await call(list.GET, who, 'GET', '/api/v1/climates');
				expect(r.status).toBe(200);
				expect(r.json.items.map((c: { name: string }) => c.name).sort()).toEqual([
					'By CSV',
					'By JSON',
					'CSV in JSON'
				]);
			}
		});

		it('refuses assessors and supervisors changes (403)', async () => {
			const t = await makeTeam();
			for (const who of [t.assessor, t.supervisor]) {
				const r = await call(list.POST, who, 'POST', '/api/v1/climates', {
					body: { name: 'X', source: 'Y', months: months() }
				});
				expect(r.status).toBe(403);
			}
			const c = await climates.createClimate(asMember(t.admin), {
				name: 'Kept',
				source: 'Test',
				months: months()
			});
			const del = await call(one.DELETE, t.supervisor, 'DELETE', `/api/v1/climates/${c.id}`, {
				params: { climateId: c.id }
			});
			expect(del.status).toBe(403);
			expect(await climates.getClimate(t.org.id, c.id)).not.toBeNull();
		});

		it('answers bad input with 400 and one issue per field, writing nothing', async () => {
			const t = await makeTeam();
			const eleven = await call(list.POST, t.admin, 'POST', '/api/v1/climates', {
				body: { name: 'Short', source: 'Test', months: months().slice(0, 11) }
			});
			expect(eleven.status).toBe(400);
			expect(eleven.json.issues).toContainEqual({ path: 'months', message: '11 months given, 12 needed' });
			const wet = months();
			wet[6].relativeHumidity = 105;
			const r = await call(list.POST, t.admin, 'POST', '/api/v1/climates', {
				body: { name: '', source: 'Test', months: wet }
			});
			expect(r.status).toBe(400);
			expect(r.json.issues).toEqual(
				expect.arrayContaining([
					{ path: 'name', message: 'name is required' },
					{ path: 'months.6.relativeHumidity', message: 'must be 0–100 %' }
				])
			);
			const dup = months();
			dup[4].month = 4;
			const d = await call(list.POST, t.admin, 'POST', '/api/v1/climates', {
				body: { name: 'Dup', source: 'Test', months: dup }
			});
			expect(d.json.issues).toContainEqual({ path: 'months.4.month', message: 'month 4 appears twice' });
			const badCsv = fs.readFileSync(path.join(FIXTURES, 'bad/text-in-number.csv'), 'utf8');
			const c = await call(list.POST, t.admin, 'POST', '/api/v1/climates?name=Bad&source=Test', {
				csv: badCsv
			});
			expect(c.status).toBe(400);
			expect(c.json.issues[0]).toMatchObject({ path: 'csv', line: 7, field: 'relative_humidity' });
			const notJson = await call(list.POST, t.admin, 'POST', '/api/v1/climates', { body: undefined });
			expect(notJson.status).toBe(400);
			expect(await tdb()('climates').where({ organisation_id: t.org.id })).toHaveLength(0);
		});

		it("gives another organisation's member 404 for every method, without echoing the id", async () => {
			const a = await makeTeam();
			const b = await makeTeam();
			const c = await climates.createClimate(asMember(a.admin), {
				name: 'Private',
				source: 'Test',
				months: months()
			});
			const params = { climateId: c.id };
			const url = `/api/v1/climates/${c.id}`;
			for (const [h, method, body] of [
				[one.GET, 'GET', undefined],
				[one.PUT, 'PUT', { name: 'Taken', source: 'x', months: months() }],
				[one.PUT, 'PUT', {}],
				[one.DELETE, 'DELETE', undefined]
			] as const) {
				const r = await call(h, b.admin, method, url, { params, body });
				expect(r.status, method).toBe(404);
				expect(r.text).not.toContain(c.id);
				expect(r.text).not.toContain('Private');
			}
			expect((await climates.getClimate(a.org.id, c.id))?.name).toBe('Private');
		});

		it('answers 409 when deleting a climate in use, with the reason', async () => {
			const t = await makeTeam();
			const c = await climates.createClimate(asMember(t.admin), {
				name: 'Busy',
				source: 'Test',
				months: months()
			});
			await tdb()('dwellings').insert({
				organisation_id: t.org.id,
				reference: `D-${c.id.slice(0, 6)}`,
				climate_id: c.id
			});
			const r = await call(one.DELETE, t.admin, 'DELETE', `/api/v1/climates/${c.id}?version=${c.version}`, {
				params: { climateId: c.id }
			});
			expect(r.status).toBe(409);
			expect(r.json.message).toMatch(/"Busy" is used by 1 dwelling/);
		});
	});

	describe('demo seed', () => {
		it('is idempotent and labels every demo climate illustrative and invented', async () => {
			// Seeds are plain JS run by the Knex CLI: import them by URL so the type check stays on the tests.
			const seedUrl = (name: string) => pathToFileURL(path.resolve('db/seeds', name)).href;
			const orgs = await import(/* @vite-ignore */ seedUrl('01_organisations.js'));
			const seed = await import(/* @vite-ignore */ seedUrl('03_climates_limits.js'));
			await orgs.seed(tdb());
			await seed.seed(tdb());
			await seed.seed(tdb());
			for (const org of ['00000000-0000-4000-8000-000000000001', '00000000-0000-4000-8000-000000000002']) {
				const rows = await tdb()('climates').where({ organisation_id: org });
				expect(rows).toHaveLength(3);
				for (const r of rows) {
					expect(r.illustrative).toBe(true);
					expect(r.source).toMatch(/Invented for the Envelo demo/);
					expect(r.months).toHaveLength(12);
				}
				expect(await tdb()('limit_tables').where({ organisation_id: org, is_default: true })).toHaveLength(1);
				expect(await tdb()('templates').where({ organisation_id: org })).toHaveLength(3);
			}
		});
	});
});

// The OpenAPI fragment is generated from the same zod schemas the endpoints use (no database needed).
describe('OpenAPI paths', async () => {
	const paths = {
		...(await import('../../../src/lib/server/climates/openapi')).paths,
		...(await import('../../../src/lib/server/limit-tables/openapi')).paths,
		...(await import('../../../src/lib/server/templates/openapi')).paths
	};
	it('describes every climates, limit-tables and templates endpoint with JSON schemas from zod', () => {
		expect(Object.keys(paths).sort()).toEqual([
			'/api/v1/climates',
			'/api/v1/climates/{climateId}',
			'/api/v1/limit-tables',
			'/api/v1/limit-tables/{limitTableId}',
			'/api/v1/limit-tables/{limitTableId}/default',
			'/api/v1/templates',
			'/api/v1/templates/{templateId}'
		]);
		const put = (paths['/api/v1/climates/{climateId}'] as any).put;
		const body = put.requestBody.content['application/json'].schema;
		expect(body.required).toEqual(expect.arrayContaining(['name', 'source', 'months']));
		expect(body.properties.months.items.properties.relativeHumidity).toMatchObject({ type: 'number' });
		const lt = (paths['/api/v1/limit-tables'] as any).post.requestBody.content['application/json'].schema;
		expect(
			lt.properties.limits.propertyNames?.enum ?? Object.keys(lt.properties.limits.properties ?? {})
		).toContain('external-wall');
		expect(JSON.stringify(paths)).not.toMatch(/undefined/);
	});
});
