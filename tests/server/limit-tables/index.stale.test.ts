import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent, asMember, callHandler as call } from '../../factories';
import { LIMIT_KINDS } from '../../../src/lib/limit-tables/schema';

// Two people editing the same limit table: the later save from the same loaded version is refused (409
// with the version now stored) and the earlier one's values stay. Envelo's own rule, the same as for
// dwellings and elements (common practice, no source). The limits are invented.

const LIMITS = { 'external-wall': 0.3, 'flat-roof': 0.18, window: 1.6 };

describe.skipIf(!hasDatabase)('limit tables: stale saves', async () => {
	const lt = await import('../../../src/lib/server/limit-tables');
	const { STALE_MESSAGE } = await import('../../../src/lib/server/errors');
	const one = await import('../../../src/routes/api/v1/limit-tables/[limitTableId=uuid]/+server');
	const page =
		await import('../../../src/routes/(app)/organisation/limit-tables/[limitTableId=uuid]/+page.server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	/** A default table (which nothing else needs) and a second one, the one edited. */
	const make = async () => {
		const t = await makeTeam();
		const admin = asMember(t.admin);
		const def = await lt.createLimitTable(admin, { name: 'Default', edition: '1', limits: LIMITS });
		const table = await lt.createLimitTable(admin, { name: 'Scheme', edition: '1', limits: LIMITS });
		return { t, def, table };
	};

	it('API: the second PUT from the same loaded version gets 409 with currentVersion; the first one stays', async () => {
		const { t, table } = await make();
		expect(table.version).toBe(1);
		const url = `/api/v1/limit-tables/${table.id}`;
		const params = { limitTableId: table.id };
		const loaded = (await call(one.GET, t.admin, 'GET', url, { params })).json;
		const first = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'Scheme', edition: 'First', limits: { ...LIMITS, door: 1.8 }, version: loaded.version }
		});
		expect(first.status).toBe(200);
		expect(first.json.version).toBe(2);
		// Stale even with confirm: the version is checked before anything else.
		const second = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: {
				name: 'Scheme',
				edition: 'Second',
				limits: { window: 1.2 },
				confirm: true,
				version: loaded.version
			}
		});
		expect(second.status).toBe(409);
		expect(second.json).toEqual({ message: STALE_MESSAGE, currentVersion: 2 });
		expect(await lt.getLimitTable(t.org.id, table.id)).toMatchObject({
			edition: 'First',
			limits: { ...LIMITS, door: 1.8 },
			version: 2
		});
		const noVersion = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'Scheme', edition: 'None', limits: LIMITS }
		});
		expect(noVersion.status).toBe(400);
		expect(noVersion.json.issues.map((i: { path: string }) => i.path)).toEqual(['version']);
	});

	it('raises the version of both tables when the default changes, so an edit opened before is stale', async () => {
		const { t, def, table } = await make();
		await lt.setDefaultLimitTable(asMember(t.admin), table.id);
		expect((await lt.getLimitTable(t.org.id, table.id))?.version).toBe(2);
		expect((await lt.getLimitTable(t.org.id, def.id))?.version).toBe(2);
		await expect(
			lt.updateLimitTable(asMember(t.admin), def.id, {
				name: 'Default',
				edition: '2',
				limits: LIMITS,
				version: def.version
			})
		).rejects.toMatchObject({ status: 409, message: STALE_MESSAGE, current: 2 });
	});

	it('API: DELETE needs ?version=, and a stale one gets 409 with currentVersion', async () => {
		const { t, table } = await make();
		const url = `/api/v1/limit-tables/${table.id}`;
		const params = { limitTableId: table.id };
		expect((await call(one.DELETE, t.admin, 'DELETE', url, { params })).status).toBe(400);
		await lt.updateLimitTable(asMember(t.admin), table.id, {
			name: 'Scheme',
			edition: '1a',
			limits: LIMITS,
			version: 1
		});
		const stale = await call(one.DELETE, t.admin, 'DELETE', `${url}?version=1`, { params });
		expect(stale.status).toBe(409);
		expect(stale.json).toEqual({ message: STALE_MESSAGE, currentVersion: 2 });
		expect((await call(one.DELETE, t.admin, 'DELETE', `${url}?version=2`, { params })).status).toBe(204);
		expect(await lt.getLimitTable(t.org.id, table.id)).toBeNull();
	});

	it('page: the second save from the same loaded page gets the conflict message and keeps what was typed', async () => {
		const { t, table } = await make();
		const path = `/organisation/limit-tables/${table.id}`;
		const loaded: any = await page.load({
			...fakeEvent(t.admin, path),
			params: { limitTableId: table.id }
		} as any);
		const version = loaded.table.version as number;
		const submit = (edition: string, wall: string) => {
			const fd = new FormData();
			fd.set('name', 'Scheme');
			fd.set('edition', edition);
			for (const kind of LIMIT_KINDS) fd.append('limit', kind === 'external-wall' ? wall : '');
			fd.set('version', String(version));
			return page.actions.update({
				...fakeEvent(t.admin, path),
				params: { limitTableId: table.id },
				request: new Request(`http://127.0.0.1${path}?/update`, { method: 'POST', body: fd })
			} as any) as Promise<any>;
		};
		expect((await submit('First', '0.26')).form.message).toBe('Limit table saved.');
		const second = await submit('Second', '0,22');
		expect(second.status).toBe(409);
		expect(second.data.form.errors._errors).toEqual([STALE_MESSAGE]);
		expect(second.data.form.data.edition).toBe('Second');
		expect(second.data.form.data.limit[LIMIT_KINDS.indexOf('external-wall')]).toBe('0,22');
		expect(await lt.getLimitTable(t.org.id, table.id)).toMatchObject({
			edition: 'First',
			limits: { 'external-wall': 0.26 },
			version: 2
		});
		const updates = await tdb()('activity_log').where({
			entity: 'limit-table',
			entity_id: table.id,
			action: 'update'
		});
		expect(updates).toHaveLength(1);
	});
});
