import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb, fakeEvent } from '../../factories';
import { asMember, ref, WALL } from '../../factories-dwellings';

// The order of a dwelling's elements: one reorder of the whole list, in a transaction with the dwelling's
// version check (our own rules: scoping, roles, optimistic locking — common practice, no source).
describe.skipIf(!hasDatabase)('element order', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const order = await import('../../../src/routes/api/v1/dwellings/[dwellingId=uuid]/elements/order/+server');
	const page = await import('../../../src/routes/(app)/dwellings/[dwellingId=uuid]/+page.server');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	type M = Parameters<typeof fakeEvent>[0];
	const post = async (member: M, dwellingId: string, body: unknown) => {
		const path = `/api/v1/dwellings/${dwellingId}/elements/order`;
		const ev = fakeEvent(member, path) as Record<string, unknown>;
		ev.request = new Request(`http://127.0.0.1${path}`, {
			method: 'POST',
			body: JSON.stringify(body),
			headers: { 'content-type': 'application/json' }
		});
		ev.params = { dwellingId };
		try {
			return await order.POST(ev as never);
		} catch (e) {
			const s = (e as { status?: number }).status;
			if (typeof s === 'number') return new Response(JSON.stringify(e), { status: s });
			throw e;
		}
	};
	const given = (name: string) => ({ name, kind: 'door', area: 2, givenU: 1.8, givenUSource: 'declared' });

	/** A dwelling with three elements: a computed wall and two doors (given U). */
	async function arrange() {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref('ORD'), address: '2 Test Row' });
		const a = await elements.createElement(m, d.id, WALL);
		const b = await elements.createElement(m, d.id, given('Back door'));
		const c = await elements.createElement(m, d.id, given('Front door'));
		const version = (await dwellings.getDwelling(t.org.id, d.id))!.version;
		return { t, m, d, ids: [a.id, b.id, c.id], version };
	}
	const currentOrder = async (orgId: string, dwellingId: string) =>
		(await elements.listElementSummaries(orgId, dwellingId)).map((e) => e.id);

	it('stores a new order as positions 0…n−1, raises the dwelling version and logs it', async () => {
		const { t, d, ids, version } = await arrange();
		const wanted = [ids[2], ids[0], ids[1]];
		const res = await post(t.assessor, d.id, { ids: wanted, version });
		expect(res.status).toBe(200);
		expect(await res.json()).toEqual({ version: version + 1, ids: wanted });
		expect(await currentOrder(t.org.id, d.id)).toEqual(wanted);
		const rows = await tdb()('elements').where({ dwelling_id: d.id }).orderBy('position');
		expect(rows.map((r) => [r.id, r.position])).toEqual(wanted.map((id, i) => [id, i]));
		expect(rows.every((r) => r.version === 1)).toBe(true); // the elements themselves did not change
		const log = await tdb()('activity_log')
			.where({ organisation_id: t.org.id, entity: 'dwelling', entity_id: d.id, action: 'reorder' })
			.first();
		expect(log.details).toEqual({ before: ids, after: wanted });
		// The same order again writes nothing and keeps the version.
		const again = await post(t.assessor, d.id, { ids: wanted, version: version + 1 });
		expect((await again.json()).version).toBe(version + 1);
	});

	it('refuses a stale version with 409 and the current version; nothing is written', async () => {
		const { t, m, d, ids, version } = await arrange();
		await dwellings.updateDwelling(m, d.id, { address: '3 Test Row', version });
		const res = await post(t.assessor, d.id, { ids: [...ids].reverse(), version });
		expect(res.status).toBe(409);
		expect((await res.json()).currentVersion).toBe(version + 1);
		expect(await currentOrder(t.org.id, d.id)).toEqual(ids);
	});

	it('names each bad id: missing, twice, not of this dwelling, not an id, no version', async () => {
		const { t, m, d, ids, version } = await arrange();
		const other = await dwellings.createDwelling(m, { reference: ref('ORD') });
		const stranger = await elements.createElement(m, other.id, given('Side door'));
		const cases: [unknown, { path: string; message: RegExp }][] = [
			[
				{ ids: ids.slice(0, 2), version },
				{ path: 'ids', message: /leaves out 1 of the dwelling’s 3/ }
			],
			[
				{ ids: [ids[0], ids[0], ids[1], ids[2]], version },
				{ path: 'ids.1', message: /listed twice/ }
			],
			[
				{ ids: [ids[0], ids[1], stranger.id], version },
				{ path: 'ids.2', message: /not an element of this/ }
			],
			[
				{ ids: [ids[0], 'abc', ids[2]], version },
				{ path: 'ids.1', message: /must be the id of an element/ }
			],
			[{ ids }, { path: 'version', message: /is required/ }],
			[{ version }, { path: 'ids', message: /is required/ }]
		];
		for (const [body, issue] of cases) {
			const res = await post(t.assessor, d.id, body);
			expect(res.status, JSON.stringify(body)).toBe(400);
			const { issues } = await res.json();
			expect(issues, JSON.stringify(body)).toContainEqual({
				path: issue.path,
				message: expect.stringMatching(issue.message)
			});
		}
		expect(await currentOrder(t.org.id, d.id)).toEqual(ids);
		expect((await dwellings.getDwelling(t.org.id, d.id))!.version).toBe(version);
	});

	it('supervisors may not reorder; another organisation gets 404; archived dwellings refuse', async () => {
		const { t, m, d, ids, version } = await arrange();
		expect((await post(t.supervisor, d.id, { ids, version })).status).toBe(403);
		const other = await makeTeam();
		const foreign = await post(other.admin, d.id, { ids: [...ids].reverse(), version });
		expect(foreign.status).toBe(404);
		expect(JSON.stringify(await foreign.json())).not.toContain(d.reference);
		const archived = await dwellings.setDwellingArchived(m, d.id, true, version);
		const res = await post(t.assessor, d.id, { ids: [...ids].reverse(), version: archived.version });
		expect(res.status).toBe(409);
		expect(await currentOrder(t.org.id, d.id)).toEqual(ids);
	});

	it('the dwelling page moves one element a place up or down', async () => {
		const { t, d, ids, version } = await arrange();
		const move = async (elementId: string, direction: string, v: number) => {
			const ev = fakeEvent(t.assessor, `/dwellings/${d.id}`) as Record<string, unknown>;
			const body = new FormData();
			body.set('elementId', elementId);
			body.set('direction', direction);
			body.set('version', String(v));
			ev.request = new Request(`http://127.0.0.1/dwellings/${d.id}?/moveElement`, { method: 'POST', body });
			ev.params = { dwellingId: d.id };
			return (await page.actions.moveElement(ev as never)) as Record<string, any>;
		};
		const down = await move(ids[0], 'down', version);
		expect(down.moved).toEqual({ id: ids[0], direction: 'down', version: version + 1 });
		expect(down.done).toMatch(/place 2 of 3/);
		expect(await currentOrder(t.org.id, d.id)).toEqual([ids[1], ids[0], ids[2]]);
		const top = await move(ids[1], 'up', version + 1);
		expect(top.status).toBe(400);
		expect(top.data.error).toMatch(/already first/);
		const stale = await move(ids[2], 'up', version);
		expect(stale.status).toBe(409);
		expect(await currentOrder(t.org.id, d.id)).toEqual([ids[1], ids[0], ids[2]]);
	});
});
