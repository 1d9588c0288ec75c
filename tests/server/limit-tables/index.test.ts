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
import { LIMIT_KINDS } from '../../../src/lib/limit-tables/schema';

// Limit tables: Envelo's own rules for defaults, validation and access (common practice, no source).

const LIMITS = { 'external-wall': 0.3, 'flat-roof': 0.18, window: 1.6 };

describe.skipIf(!hasDatabase)('limit tables', async () => {
	const lt = await import('../../../src/lib/server/limit-tables');
	const list = await import('../../../src/routes/api/v1/limit-tables/+server');
	const one = await import('../../../src/routes/api/v1/limit-tables/[limitTableId=uuid]/+server');
	const makeDefault =
		await import('../../../src/routes/api/v1/limit-tables/[limitTableId=uuid]/default/+server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('makes the first table the default, and keeps exactly one default', async () => {
		const t = await makeTeam();
		const admin = asMember(t.admin);
		const first = await lt.createLimitTable(admin, { name: 'Scheme A', edition: '1', limits: LIMITS });
		expect(first.isDefault).toBe(true);
		const second = await lt.createLimitTable(admin, { name: 'Scheme B', edition: '1', limits: LIMITS });
		expect(second.isDefault).toBe(false);
		expect((await lt.getDefaultLimitTable(t.org.id))?.id).toBe(first.id);
		const third = await lt.createLimitTable(admin, {
			name: 'Scheme C',
			edition: '2',
			dated: '2025-10-01',
			limits: LIMITS,
			isDefault: true
		});
		expect(third.isDefault).toBe(true);
		expect(third.dated).toBe('2025-10-01');
		await lt.setDefaultLimitTable(admin, second.id);
		const all = await lt.listLimitTables(t.org.id);
		expect(all.filter((x) => x.isDefault).map((x) => x.id)).toEqual([second.id]);
		expect(all[0].id).toBe(second.id); // the default is listed first
		// The database itself refuses a second default (partial unique index).
		await expect(tdb()('limit_tables').where({ id: first.id }).update({ is_default: true })).rejects.toThrow(
			/unique/
		);
		expect(lt.limitFor(all[0], 'flat-roof')).toBe(0.18);
		expect(lt.limitFor(all[0], 'door')).toBeNull();
	});

	it('refuses deleting a table in use, and the default while others exist', async () => {
		const t = await makeTeam();
		const admin = asMember(t.admin);
		const def = await lt.createLimitTable(admin, { name: 'Default', edition: '1', limits: LIMITS });
		const other = await lt.createLimitTable(admin, { name: 'Other', edition: '1', limits: LIMITS });
		await tdb()('dwellings').insert({
			organisation_id: t.org.id,
			reference: 'LT-1',
			limit_table_id: other.id
		});
		await expect(lt.deleteLimitTable(admin, other.id, other.version)).rejects.toThrow(
			/"Other \(1\)" is used by 1 dwelling/
		);
		await expect(lt.deleteLimitTable(admin, def.id, def.version)).rejects.toThrow(
			/make another table the default/
		);
		await tdb()('dwellings').where({ organisation_id: t.org.id }).update({ limit_table_id: null });
		expect(await lt.deleteLimitTable(admin, other.id, other.version)).toBe(true);
		// the only table, with dwellings judged against it
		await expect(lt.deleteLimitTable(admin, def.id, def.version)).rejects.toThrow(/only limit table/);
		expect(await lt.getLimitTable(t.org.id, def.id)).not.toBeNull();
	});

	it('validates with a message per field (400), and refuses non-admins (403)', async () => {
		const t = await makeTeam();
		const r = await call(list.POST, t.admin, 'POST', '/api/v1/limit-tables', {
			body: {
				name: 'Bad',
				edition: '',
				dated: '2025-13-01',
				limits: { 'external-wall': 0, 'flat-roof': 'x', attic: 0.2 }
			}
		});
		expect(r.status).toBe(400);
		const paths = r.json.issues.map((i: { path: string }) => i.path);
		expect(paths).toEqual(
			expect.arrayContaining(['edition', 'dated', 'limits.external-wall', 'limits.flat-roof'])
		);
		expect(r.json.issues).toContainEqual({
			path: 'limits.external-wall',
			message: 'must be greater than 0 W/(m²·K)'
		});
		const empty = await call(list.POST, t.admin, 'POST', '/api/v1/limit-tables', {
			body: { name: 'Empty', edition: '1', limits: {} }
		});
		expect(empty.json.issues).toContainEqual({
			path: 'limits',
			message: 'give a maximum U for at least one element kind'
		});
		for (const who of [t.assessor, t.supervisor]) {
			const f = await call(list.POST, who, 'POST', '/api/v1/limit-tables', {
				body: { name: 'X', edition: '1', limits: LIMITS }
			});
			expect(f.status).toBe(403);
		}
		expect(await tdb()('limit_tables').where({ organisation_id: t.org.id })).toHaveLength(0);
	});

	it('answers 409 for a duplicate name and edition', async () => {
		const t = await makeTeam();
		const body = { name: 'Same', edition: '2024', limits: LIMITS };
		expect((await call(list.POST, t.admin, 'POST', '/api/v1/limit-tables', { body })).status).toBe(201);
		const again = await call(list.POST, t.admin, 'POST', '/api/v1/limit-tables', { body });
		expect(again.status).toBe(409);
		expect(again.json.message).toMatch(/already exists/);
	});

	it('updates through the API and sets the default; readers see it', async () => {
		const t = await makeTeam();
		const a = await lt.createLimitTable(asMember(t.admin), { name: 'A', edition: '1', limits: LIMITS });
		const b = await lt.createLimitTable(asMember(t.admin), { name: 'B', edition: '1', limits: LIMITS });
		const put = await call(one.PUT, t.admin, 'PUT', `/api/v1/limit-tables/${b.id}`, {
			params: { limitTableId: b.id },
			body: {
				name: 'B',
				edition: '2',
				source: 'A test document, table 1',
				limits: { ...LIMITS, door: 1.8 },
				version: b.version
			}
		});
		expect(put.status).toBe(200);
		expect(put.json).toMatchObject({ edition: '2', isDefault: false, limits: { door: 1.8 } });
		const d = await call(makeDefault.POST, t.admin, 'POST', `/api/v1/limit-tables/${b.id}/default`, {
			params: { limitTableId: b.id }
		});
		expect(d.json.isDefault).toBe(true);
		expect((await lt.getLimitTable(t.org.id, a.id))?.isDefault).toBe(false);
		const seen = await call(list.GET, t.supervisor, 'GET', '/api/v1/limit-tables');
		expect(seen.json.items.map((x: { id: string }) => x.id)).toEqual([b.id, a.id]);
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'limit-table' })
			.orderBy('id');
		expect(log.map((r) => r.action)).toEqual(['create', 'create', 'update', 'set-default']);
	});

	// Editing limits in place re-judges every dwelling using the table: Envelo's own safeguard (common
	// practice, no source): warn with the count, save only when confirmed, log old and new limits.
	it('asks to confirm new limits on a table dwellings use, then logs the old and new limits', async () => {
		const t = await makeTeam();
		const a = await lt.createLimitTable(asMember(t.admin), { name: 'A', edition: '1', limits: LIMITS });
		const b = await lt.createLimitTable(asMember(t.admin), { name: 'B', edition: '1', limits: LIMITS });
		const dwelling = (limitTableId: string | null) => ({
			organisation_id: t.org.id,
			reference: `D-${Math.random().toString(36).slice(2, 10)}`,
			address: '1 Test Row',
			status: 'draft',
			limit_table_id: limitTableId
		});
		await tdb()('dwellings').insert([dwelling(b.id), dwelling(null), dwelling(null)]);
		expect(await lt.limitTableUsage(t.org.id, b.id)).toEqual({
			named: 1,
			byDefault: 0,
			dwellings: 1,
			isDefault: false
		});
		expect(await lt.limitTableUsage(t.org.id, a.id)).toEqual({
			named: 0,
			byDefault: 2,
			dwellings: 2,
			isDefault: true
		});

		const url = `/api/v1/limit-tables/${b.id}`;
		const params = { limitTableId: b.id };
		// a new edition name with the same limits judges nobody differently: no confirmation needed
		const renamed = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'B', edition: '1a', limits: LIMITS, version: 1 }
		});
		expect(renamed.status).toBe(200);
		// a changed limit without confirm: 409 with the count and the changes, nothing saved
		const newLimits = { ...LIMITS, 'external-wall': 0.28 };
		const refused = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'B', edition: '2', limits: newLimits, version: 2 }
		});
		expect(refused.status).toBe(409);
		expect(refused.json).toMatchObject({
			needsConfirm: true,
			dwellings: 1,
			changes: [{ kind: 'external-wall', from: 0.3, to: 0.28 }]
		});
		expect(refused.json.message).toContain('used by 1 dwelling;');
		expect(refused.json.message).toContain('pass/fail will be re-evaluated');
		expect(refused.json.message).toContain('Issued reports keep the limits they were issued with');
		expect((await lt.getLimitTable(t.org.id, b.id))?.limits).toEqual(LIMITS);
		const badConfirm = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'B', edition: '2', limits: newLimits, confirm: 'yes', version: 2 }
		});
		expect(badConfirm.status).toBe(400);
		expect(badConfirm.json.issues).toEqual([{ path: 'confirm', message: 'confirm must be true or false' }]);
		const saved = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'B', edition: '2', limits: newLimits, confirm: true, version: 2 }
		});
		expect(saved.status).toBe(200);
		expect(saved.json.limits).toEqual(newLimits);
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'limit-table', entity_id: b.id, action: 'update' })
			.orderBy('id', 'desc')
			.first();
		expect(log.details).toMatchObject({
			previousLimits: LIMITS,
			limits: newLimits,
			changes: [{ kind: 'external-wall', from: 0.3, to: 0.28 }],
			dwellingsJudged: 1,
			confirmed: true
		});

		// the default judges the dwellings naming no table; the page form needs its box ticked
		await expect(
			lt.updateLimitTable(asMember(t.admin), a.id, {
				name: 'A',
				edition: '1',
				limits: { window: 1.4 },
				version: a.version
			})
		).rejects.toThrow("used by 2 dwellings as the organisation's default;");
		const page =
			await import('../../../src/routes/(app)/organisation/limit-tables/[limitTableId=uuid]/+page.server');
		const loaded: any = await page.load({
			...fakeEvent(t.supervisor, `/organisation/limit-tables/${a.id}`),
			params: { limitTableId: a.id }
		} as any);
		expect(loaded.changeWarning).toContain('used by 2 dwellings');
		const submit = async (confirm: boolean) => {
			const fd = new FormData();
			fd.set('name', 'A');
			fd.set('edition', '1');
			for (const kind of LIMIT_KINDS) fd.append('limit', kind === 'window' ? '1.4' : '');
			fd.set('version', String(a.version));
			if (confirm) fd.set('confirm', 'on');
			const path = `/organisation/limit-tables/${a.id}`;
			return page.actions.update({
				...fakeEvent(t.admin, path),
				params: { limitTableId: a.id },
				request: new Request(`http://127.0.0.1${path}?/update`, { method: 'POST', body: fd })
			} as any);
		};
		const unconfirmed: any = await submit(false);
		expect(unconfirmed.status).toBe(409);
		expect(unconfirmed.data.limitTableForm.errors.confirm).toEqual([
			'Not saved: tick the box to confirm the new limits for 2 dwellings.'
		]);
		expect(unconfirmed.data.changes.map((c: { kind: string }) => c.kind)).toEqual([
			'external-wall',
			'flat-roof',
			'window'
		]);
		expect((await lt.getLimitTable(t.org.id, a.id))?.limits).toEqual(LIMITS);
		expect(((await submit(true)) as any).form.message).toBe('Limit table saved.');
		expect((await lt.getLimitTable(t.org.id, a.id))?.limits).toEqual({ window: 1.4 });
	});

	it("gives another organisation's member 404 everywhere, without echoing the id", async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		const table = await lt.createLimitTable(asMember(a.admin), {
			name: 'Private table',
			edition: '1',
			limits: LIMITS
		});
		const params = { limitTableId: table.id };
		const url = `/api/v1/limit-tables/${table.id}`;
		for (const [h, method, body] of [
			[one.GET, 'GET', undefined],
			[one.PUT, 'PUT', {}],
			[one.PUT, 'PUT', { name: 'Mine', edition: '1', limits: LIMITS }],
			[one.DELETE, 'DELETE', undefined],
			[makeDefault.POST, 'POST', {}]
		] as const) {
			const r = await call(h, b.admin, method, url, { params, body });
			expect(r.status, method).toBe(404);
			expect(r.text).not.toContain(table.id);
			expect(r.text).not.toContain('Private');
		}
		const other = await makeMember(b.org.id, 'assessor');
		expect((await call(list.GET, other, 'GET', '/api/v1/limit-tables')).json.items).toEqual([]);
		expect((await lt.getLimitTable(a.org.id, table.id))?.name).toBe('Private table');
	});
});
