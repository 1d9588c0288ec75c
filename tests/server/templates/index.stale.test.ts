import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent, asMember, callHandler as call } from '../../factories';

// Two people editing the same template: the later save from the same loaded version is refused (409 with
// the version now stored) and the earlier one's values stay. Envelo's own rule, the same as for dwellings
// and elements (common practice, no source).

/** A timber-frame wall (generic values, common practice, no source). */
const WALL = {
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
		{ name: 'Mineral wool', thicknessMm: 140, lambda: 0.035, mu: 1 },
		{ name: 'Sheathing board', thicknessMm: 9, lambda: 0.13, mu: 150 }
	]
};

describe.skipIf(!hasDatabase)('templates: stale saves', async () => {
	const templates = await import('../../../src/lib/server/templates');
	const { STALE_MESSAGE } = await import('../../../src/lib/server/errors');
	const one = await import('../../../src/routes/api/v1/templates/[templateId=uuid]/+server');
	const page = await import('../../../src/routes/(app)/templates/[templateId=uuid]/+page.server');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const make = async () => {
		const t = await makeTeam();
		const tpl = await templates.createTemplate(asMember(t.assessor), {
			name: `Timber wall ${Math.random().toString(36).slice(2, 8)}`,
			kind: 'external-wall',
			description: 'As saved',
			buildUp: WALL
		});
		return { t, tpl };
	};

	it('API: the second PATCH from the same loaded version gets 409 with currentVersion; the first one stays', async () => {
		const { t, tpl } = await make();
		expect(tpl.version).toBe(1);
		const url = `/api/v1/templates/${tpl.id}`;
		const params = { templateId: tpl.id };
		const loaded = (await call(one.GET, t.admin, 'GET', url, { params })).json;
		const first = await call(one.PATCH, t.assessor, 'PATCH', url, {
			params,
			body: { description: 'First save', version: loaded.version }
		});
		expect(first.status).toBe(200);
		expect(first.json).toMatchObject({ description: 'First save', version: 2 });
		const second = await call(one.PUT, t.admin, 'PUT', url, {
			params,
			body: { name: 'Second save', description: 'Second save', version: loaded.version }
		});
		expect(second.status).toBe(409);
		expect(second.json).toEqual({ message: STALE_MESSAGE, currentVersion: 2 });
		expect(await tdb()('templates').where({ id: tpl.id }).first()).toMatchObject({
			name: tpl.name,
			description: 'First save',
			version: 2
		});
	});

	it('API: a PATCH without a version is refused (400, on the field); DELETE needs ?version= and refuses a stale one', async () => {
		const { t, tpl } = await make();
		const url = `/api/v1/templates/${tpl.id}`;
		const params = { templateId: tpl.id };
		const noVersion = await call(one.PATCH, t.assessor, 'PATCH', url, {
			params,
			body: { description: 'No version' }
		});
		expect(noVersion.status).toBe(400);
		expect(noVersion.json.issues.map((i: { path: string }) => i.path)).toEqual(['version']);
		const none = await call(one.DELETE, t.assessor, 'DELETE', url, { params });
		expect(none.status).toBe(400);
		expect(none.json.issues[0].path).toBe('version');
		await templates.updateTemplate(asMember(t.admin), tpl.id, { description: 'Meanwhile', version: 1 });
		const stale = await call(one.DELETE, t.assessor, 'DELETE', `${url}?version=1`, { params });
		expect(stale.status).toBe(409);
		expect(stale.json).toEqual({ message: STALE_MESSAGE, currentVersion: 2 });
		expect(await templates.getTemplate(t.org.id, tpl.id)).not.toBeNull();
		expect((await call(one.DELETE, t.assessor, 'DELETE', `${url}?version=2`, { params })).status).toBe(204);
	});

	it('page: the second save from the same loaded page gets the conflict message and keeps what was typed', async () => {
		const { t, tpl } = await make();
		const path = `/templates/${tpl.id}`;
		const loaded: any = await page.load({
			...fakeEvent(t.admin, path),
			params: { templateId: tpl.id }
		} as any);
		const version = loaded.template.version as number;
		const submit = (who: typeof t.admin, name: string, description: string) => {
			const fd = new FormData();
			fd.set('name', name);
			fd.set('kind', 'external-wall');
			fd.set('description', description);
			fd.set('version', String(version));
			return page.actions.update({
				...fakeEvent(who, path),
				params: { templateId: tpl.id },
				request: new Request(`http://127.0.0.1${path}?/update`, { method: 'POST', body: fd })
			} as any) as Promise<any>;
		};
		const first = await submit(t.assessor, tpl.name, 'Saved first');
		expect(first.form.message).toBe('Template saved.');
		const second = await submit(t.admin, 'Typed second', 'Typed second');
		expect(second.status).toBe(409);
		expect(second.data.stale).toBe(STALE_MESSAGE);
		// The form comes back as typed, the version still the one loaded (the page offers to reload).
		expect(second.data.form.data).toEqual({
			name: 'Typed second',
			kind: 'external-wall',
			description: 'Typed second',
			version
		});
		expect(await templates.getTemplate(t.org.id, tpl.id)).toMatchObject({
			name: tpl.name,
			description: 'Saved first',
			version: 2
		});
	});
});
