import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent, asMember, callHandler as call } from '../../factories';

// Two people editing the same climate: the later save from the same loaded version is refused (409 with
// the version now stored) and the earlier one's values stay. Envelo's own rule, the same as for dwellings
// and elements (common practice, no source). The figures are invented.

const months = (t0: number) =>
	Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature: t0 + i, relativeHumidity: 80 }));

describe.skipIf(!hasDatabase)('climates: stale saves', async () => {
	const climates = await import('../../../src/lib/server/climates');
	const { STALE_MESSAGE } = await import('../../../src/lib/server/errors');
	const one = await import('../../../src/routes/api/v1/climates/[climateId=uuid]/+server');
	const page = await import('../../../src/routes/(app)/climates/[climateId=uuid]/+page.server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const make = async () => {
		const t = await makeTeam();
		const c = await climates.createClimate(asMember(t.admin), {
			name: `Upland ${Math.random().toString(36).slice(2, 8)}`,
			source: 'Invented test figures',
			months: months(-2)
		});
		return { t, c };
	};

	it('starts a climate at version 1 and raises it by one on every save', async () => {
		const { t, c } = await make();
		expect(c.version).toBe(1);
		const saved = await climates.updateClimate(asMember(t.admin), c.id, {
			name: c.name,
			source: 'Revised',
			months: months(0),
			version: 1
		});
		expect(saved?.version).toBe(2);
		const read = await call(one.GET, t.supervisor, 'GET', `/api/v1/climates/${c.id}`, {
			params: { climateId: c.id }
		});
		expect(read.json.version).toBe(2);
	});

	it('API: the second PUT from the same loaded version gets 409 with currentVersion; the first one stays', async () => {
		const { t, c } = await make();
		const url = `/api/v1/climates/${c.id}`;
		const params = { climateId: c.id };
		const loaded = (await call(one.GET, t.admin, 'GET', url, { params })).json;
		const first = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: loaded.name, source: 'First save', months: months(1), version: loaded.version }
		});
		expect(first.status).toBe(200);
		expect(first.json.version).toBe(loaded.version + 1);
		const second = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'Second save', source: 'Second save', months: months(5), version: loaded.version }
		});
		expect(second.status).toBe(409);
		expect(second.json).toEqual({ message: STALE_MESSAGE, currentVersion: loaded.version + 1 });
		const stored = await tdb()('climates').where({ id: c.id }).first();
		expect(stored).toMatchObject({ name: loaded.name, source: 'First save', version: 2 });
		expect(stored.months[0].temperature).toBe(1);
		const updates = await tdb()('activity_log').where({
			entity: 'climate',
			entity_id: c.id,
			action: 'update'
		});
		expect(updates).toHaveLength(1);
	});

	it('API: a PUT without a version is refused (400, on the field), writing nothing', async () => {
		const { t, c } = await make();
		const r = await call(one.PUT, t.admin, 'PUT', `/api/v1/climates/${c.id}`, {
			params: { climateId: c.id },
			body: { name: 'No version', source: 'x', months: months(0) }
		});
		expect(r.status).toBe(400);
		expect(r.json.issues.map((i: { path: string }) => i.path)).toEqual(['version']);
		expect((await climates.getClimate(t.org.id, c.id))?.name).toBe(c.name);
	});

	it('API: DELETE needs ?version=, and a stale one gets 409 with currentVersion', async () => {
		const { t, c } = await make();
		const params = { climateId: c.id };
		const url = `/api/v1/climates/${c.id}`;
		const none = await call(one.DELETE, t.admin, 'DELETE', url, { params });
		expect(none.status).toBe(400);
		expect(none.json.issues).toEqual([
			{ path: 'version', message: 'is required as ?version=N: the version you loaded' }
		]);
		await climates.updateClimate(asMember(t.admin), c.id, {
			name: c.name,
			source: 'Changed meanwhile',
			months: months(0),
			version: 1
		});
		const stale = await call(one.DELETE, t.admin, 'DELETE', `${url}?version=1`, { params });
		expect(stale.status).toBe(409);
		expect(stale.json).toEqual({ message: STALE_MESSAGE, currentVersion: 2 });
		expect(await climates.getClimate(t.org.id, c.id)).not.toBeNull();
		expect((await call(one.DELETE, t.admin, 'DELETE', `${url}?version=2`, { params })).status).toBe(204);
		expect(await climates.getClimate(t.org.id, c.id)).toBeNull();
	});

	it('two saves at the same moment from the same version: exactly one is written', async () => {
		const { t, c } = await make();
		const save = (source: string) =>
			climates
				.updateClimate(asMember(t.admin), c.id, { name: c.name, source, months: months(0), version: 1 })
				.then(
					() => 'saved',
					(e) => (e.status === 409 ? 'stale' : Promise.reject(e))
				);
		const outcomes = await Promise.all([save('A'), save('B')]);
		expect(outcomes.sort()).toEqual(['saved', 'stale']);
		expect((await tdb()('climates').where({ id: c.id }).first('version')).version).toBe(2);
	});

	it('page: the second save from the same loaded page gets the conflict message and keeps what was typed', async () => {
		const { t, c } = await make();
		const path = `/climates/${c.id}`;
		const loaded: any = await page.load({ ...fakeEvent(t.admin, path), params: { climateId: c.id } } as any);
		const version = loaded.climate.version as number;
		const submit = (name: string, source: string, t0: number) => {
			const fd = new FormData();
			fd.set('name', name);
			fd.set('source', source);
			fd.set('version', String(version));
			for (const m of months(t0)) {
				fd.append('temperature', String(m.temperature));
				fd.append('relativeHumidity', String(m.relativeHumidity));
			}
			return page.actions.update({
				...fakeEvent(t.admin, path),
				params: { climateId: c.id },
				request: new Request(`http://127.0.0.1${path}?/update`, { method: 'POST', body: fd })
			} as any) as Promise<any>;
		};
		expect((await submit(c.name, 'Saved first', 3)).form.message).toBe('Climate saved.');
		const second = await submit('Typed second', 'Typed second', 7);
		expect(second.status).toBe(409);
		expect(second.data.form.errors._errors).toEqual([STALE_MESSAGE]);
		expect(second.data.form.data).toMatchObject({ name: 'Typed second', source: 'Typed second' });
		expect(second.data.form.data.temperature[0]).toBe('7');
		const stored = await climates.getClimate(t.org.id, c.id);
		expect(stored).toMatchObject({ name: c.name, source: 'Saved first', version: 2 });
		expect(stored?.months[0].temperature).toBe(3);

		// Deleting from the same stale page is refused too, with the same message.
		const fd = new FormData();
		fd.set('version', String(version));
		const del: any = await page.actions.delete({
			...fakeEvent(t.admin, path),
			params: { climateId: c.id },
			request: new Request(`http://127.0.0.1${path}?/delete`, { method: 'POST', body: fd })
		} as any);
		expect(del.status).toBe(409);
		expect(del.data.error).toBe(STALE_MESSAGE);
		expect(await climates.getClimate(t.org.id, c.id)).not.toBeNull();
	});

	it('the database keeps versions of climates, templates and limit tables at 1 or more', async () => {
		const { t, c } = await make();
		for (const table of ['climates', 'templates', 'limit_tables']) {
			const col = await tdb()('information_schema.columns')
				.where({ table_name: table, column_name: 'version' })
				.first('is_nullable', 'column_default', 'data_type');
			expect(col, table).toMatchObject({ is_nullable: 'NO', column_default: '1', data_type: 'integer' });
		}
		await expect(tdb()('climates').where({ id: c.id }).update({ version: 0 })).rejects.toMatchObject({
			code: '23514',
			constraint: 'climates_version_check'
		});
		expect((await climates.getClimate(t.org.id, c.id))?.version).toBe(1);
	});
});
