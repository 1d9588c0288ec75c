// The import endpoint as a client calls it: multipart uploads read as they arrive, a bare text/csv body,
// the commit that uses the preview the server kept, and the replies when it cannot. Our own behaviour
// (common practice, no source).
import { describe, it, expect, afterAll } from 'vitest';
import { fakeEvent, hasDatabase, makeTeam, tdb } from '../../factories';
import { fixture, generatedCsv, librarySnapshot } from '../../factories-library';

describe.skipIf(!hasDatabase)('POST /api/v1/materials/import', async () => {
	const route = await import('../../../src/routes/api/v1/materials/import/+server');
	const imp = await import('../../../src/lib/server/library/import');
	const lib = await import('../../../src/lib/server/library');
	const { db } = await import('../../../src/lib/server/db');
	afterAll(async () => {
		const { authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});
	type Team = Awaited<ReturnType<typeof makeTeam>>;

	/** Send a request as the browser would; `parts` in order, a Uint8Array part becomes the file. */
	async function post(
		t: Team,
		body: { parts: [string, string | Uint8Array][] } | { csv: string; query: string },
		as: 'assessor' | 'supervisor' = 'assessor'
	) {
		let request: Request;
		let url: URL;
		if ('parts' in body) {
			const fd = new FormData();
			for (const [name, value] of body.parts) {
				if (typeof value === 'string') fd.append(name, value);
				else
					fd.append(name, new Blob([value as Uint8Array<ArrayBuffer>], { type: 'text/csv' }), 'library.csv');
			}
			url = new URL('http://127.0.0.1/api/v1/materials/import');
			request = new Request(url, { method: 'POST', body: fd });
		} else {
			url = new URL(`http://127.0.0.1/api/v1/materials/import?${body.query}`);
			request = new Request(url, {
				method: 'POST',
				headers: { 'content-type': 'text/csv' },
				body: body.csv
			});
		}
		const event = { ...fakeEvent(t[as], url.pathname), url, request, params: {} };
		try {
			const res = await route.POST(event as never);
			return { status: res.status, json: await res.json() };
		} catch (e: any) {
			if (typeof e?.status === 'number') return { status: e.status as number, json: e.body };
			throw e;
		}
	}
	const count = async (orgId: string) =>
		Number((await tdb()('materials').where({ organisation_id: orgId }).count({ n: '*' }))[0].n);

	it('previews a multipart upload, then commits from the kept preview without the file', async () => {
		const t = await makeTeam();
		const file = fixture('materials/demo-library.csv');
		const p = await post(t, {
			parts: [
				['mode', 'preview'],
				['file', file]
			]
		});
		expect(p.status).toBe(200);
		expect(p.json).toMatchObject({ kind: 'preview', counts: { new: 44, rejected: 0 } });
		const c = await post(t, {
			parts: [
				['mode', 'commit'],
				['token', p.json.token]
			]
		});
		expect(c.status).toBe(200);
		expect(c.json).toMatchObject({ kind: 'summary', added: 44, changed: 0 });
		expect(await count(t.org.id)).toBe(44);
		const log = await tdb()('activity_log').where({ organisation_id: t.org.id, action: 'import' }).first();
		expect(log.details).toMatchObject({ added: 44, rows: 44, file: null });
	});

	it('commits as the page does (fields first, the file again) when the server no longer keeps the preview', async () => {
		const t = await makeTeam();
		const file = fixture('materials/demo-library.csv');
		const p = await post(t, { parts: [['file', file]] });
		imp.forgetKeptPreviews(); // as a restart would
		const without = await post(t, {
			parts: [
				['mode', 'commit'],
				['token', p.json.token]
			]
		});
		expect(without.status).toBe(409);
		expect(without.json.message).toMatch(/no longer kept on the server; send the file again/);
		expect(await count(t.org.id)).toBe(0);
		const c = await post(t, {
			parts: [
				['mode', 'commit'],
				['token', p.json.token],
				['confirmWarnings', 'no'],
				['file', file]
			]
		});
		expect(c.status).toBe(200);
		expect(c.json).toMatchObject({ added: 44 });
	});

	it('takes the file as a text/csv body with the fields in the query string', async () => {
		const t = await makeTeam();
		const csv = generatedCsv(30, 'QS');
		const p = await post(t, { csv, query: 'mode=preview' });
		expect(p.json).toMatchObject({ kind: 'preview', counts: { new: 30 } });
		const c = await post(t, { csv, query: `mode=commit&token=${p.json.token}` });
		expect(c.json).toMatchObject({ kind: 'summary', added: 30 });
	});

	it('refuses the commit when the library changed after the preview, even with the preview kept', async () => {
		const t = await makeTeam();
		const file = fixture('materials/demo-library.csv');
		const first = await post(t, { parts: [['file', file]] });
		await post(t, {
			parts: [
				['mode', 'commit'],
				['token', first.json.token]
			]
		});
		// Preview a changed file, then someone edits one of its materials before the commit.
		const changed = new TextEncoder().encode(
			new TextDecoder().decode(file).replace(/^(G-INS-EPS-036,.*?),0\.036,/m, '$1,0.035,')
		);
		const p = await post(t, { parts: [['file', changed]] });
		expect(p.json.counts).toMatchObject({ changed: 1 });
		const m = await lib.listMaterials(t.org.id, { q: 'G-INS-EPS-036', page: 1, pageSize: 5, sort: 'code' });
		const current = await lib.getMaterial(t.org.id, m.items[0].id);
		await lib.updateMaterial(
			{ userId: t.assessor.id, organisationId: t.org.id },
			m.items[0].id,
			{ ...current, notes: 'edited meanwhile' },
			{ confirmWarnings: true }
		);
		const before = await librarySnapshot(t.org.id);
		const c = await post(t, {
			parts: [
				['mode', 'commit'],
				['token', p.json.token]
			]
		});
		expect(c.status).toBe(409);
		expect(c.json.message).toMatch(/changed since the preview; preview the file again/);
		expect(await librarySnapshot(t.org.id)).toBe(before);
	});

	it('says which fields came after the file, and refuses what is not a CSV upload', async () => {
		const t = await makeTeam();
		const late = await post(t, {
			parts: [
				['file', fixture('materials/demo-library.csv')],
				['mapping', '{}']
			]
		});
		expect(late.status).toBe(400);
		expect(late.json.message).toMatch(/mapping came after the file and could not be used/);

		const url = new URL('http://127.0.0.1/api/v1/materials/import');
		const json = await route.POST({
			...fakeEvent(t.assessor, url.pathname),
			url,
			params: {},
			request: new Request(url, {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: '{}'
			})
		} as never);
		expect(json.status).toBe(400);
		expect((await json.json()).message).toMatch(
			/multipart\/form-data .* or as the body with Content-Type: text\/csv/
		);

		const badMapping = await post(t, {
			parts: [
				['mapping', '{"code": "colour"}'],
				['file', fixture('materials/demo-library.csv')]
			]
		});
		expect(badMapping.status).toBe(400);
		expect(badMapping.json.message).toMatch(/The column mapping must be JSON/);

		const badMode = await post(t, {
			parts: [
				['mode', 'apply'],
				['file', fixture('materials/demo-library.csv')]
			]
		});
		expect(badMode.status).toBe(400);
		expect(badMode.json.message).toBe('mode must be preview or commit');

		const noFile = await post(t, { parts: [['mode', 'preview']] });
		expect(noFile.status).toBe(400);
		expect(noFile.json.message).toMatch(/Choose a CSV file/);
	});

	it('gives a bad file its message through the endpoint, and the library is unchanged', async () => {
		const t = await makeTeam();
		const before = await librarySnapshot(t.org.id);
		const r = await post(t, { parts: [['file', fixture('bad-csv/latin1.csv')]] });
		expect(r.status).toBe(400);
		expect(r.json).toMatchObject({ code: 'not-utf8', line: 2 });
		const c = await post(t, {
			parts: [
				['mode', 'commit'],
				['token', 'x'],
				['file', fixture('bad-csv/binary.csv')]
			]
		});
		expect(c.status).toBe(400);
		expect(c.json.code).toBe('binary');
		expect(await librarySnapshot(t.org.id)).toBe(before);
	});

	it('lets supervisors look but not import', async () => {
		const t = await makeTeam();
		const r = await post(t, { parts: [['file', fixture('materials/demo-library.csv')]] }, 'supervisor');
		expect(r.status).toBe(403);
	});
});
