// The import under awkward conditions: a client that goes away mid-upload, fields sent after the file,
// a slow re-sent file, an edit of the library while a commit runs. Our own behaviour (common practice,
// no source): every request ends with a clear reply, no error escapes the server, no lock is held for
// an upload, and a commit that meets a concurrent change is refused (409) rather than failing (500).
import { describe, it, expect, afterAll } from 'vitest';
import http from 'node:http';
import net from 'node:net';
import { getRequest } from '@sveltejs/kit/node';
import { fakeEvent, hasDatabase, makeTeam, tdb } from '../../factories';
import { boardValues, fixture } from '../../factories-library';
import { AppError, ConflictError } from '../../../src/lib/server/errors';

const enc = (s: string) => new TextEncoder().encode(s);
const HEAD = 'code,name,category,lambda,lambda_kind';

describe.skipIf(!hasDatabase)('material import under awkward conditions', async () => {
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

	/** POST a body given as chunks (a stream, so the route reads it as it arrives). */
	async function send(
		t: Team,
		type: string,
		chunks: Uint8Array[],
		opts: { query?: string; pauseBeforeLast?: number } = {}
	) {
		let i = 0;
		const body = new ReadableStream<Uint8Array>({
			async pull(c) {
				if (i === chunks.length - 1 && opts.pauseBeforeLast)
					await new Promise((r) => setTimeout(r, opts.pauseBeforeLast));
				if (i < chunks.length) c.enqueue(chunks[i++]);
				else c.close();
			}
		});
		const url = new URL(`http://127.0.0.1/api/v1/materials/import${opts.query ? `?${opts.query}` : ''}`);
		const request = new Request(url, {
			method: 'POST',
			headers: { 'content-type': type },
			body,
			duplex: 'half'
		} as RequestInit);
		const res = await route.POST({
			...fakeEvent(t.assessor, url.pathname),
			url,
			request,
			params: {}
		} as never);
		return { status: res.status, json: await res.json() };
	}
	const B = 'envelo-test-boundary';
	const MULTIPART = `multipart/form-data; boundary=${B}`;
	const field = (k: string, v: string) =>
		enc(`--${B}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`);
	const filePart = (csv: Uint8Array) => [
		enc(
			`--${B}\r\nContent-Disposition: form-data; name="file"; filename="l.csv"\r\nContent-Type: text/csv\r\n\r\n`
		),
		csv,
		enc('\r\n')
	];
	const end = enc(`--${B}--\r\n`);

	for (const kind of ['text/csv', 'multipart'] as const) {
		it(`a client that goes away mid-upload (${kind}) ends the request, and nothing escapes the server`, async () => {
			const t = await makeTeam();
			const uncaught: string[] = [];
			const onUncaught = (e: Error) => uncaught.push(e.message);
			process.prependListener('uncaughtException', onUncaught);
			const server = http.createServer(async (req, res) => {
				const request = await getRequest({ request: req, base: 'http://127.0.0.1', bodySizeLimit: 25 << 20 });
				const url = new URL(request.url);
				try {
					const r = await route.POST({
						...fakeEvent(t.assessor, url.pathname),
						url,
						request,
						params: {}
					} as never);
					settled(`returned ${r.status}`);
				} catch (e) {
					settled(`threw ${(e as Error).message}`);
				}
				res.end();
			});
			let settled!: (s: string) => void;
			const outcome = new Promise<string>((r) => (settled = r));
			await new Promise<void>((r) => server.listen(0, '127.0.0.1', r));
			const csv = `${HEAD}\n` + 'C-1,Board,insulation,0.035,declared\n'.repeat(20000);
			const body =
				kind === 'multipart'
					? `--${B}\r\nContent-Disposition: form-data; name="file"; filename="a.csv"\r\n\r\n${csv}\r\n--${B}--\r\n`
					: csv;
			const socket = net.connect((server.address() as net.AddressInfo).port, '127.0.0.1', () => {
				socket.write(
					`POST /api/v1/materials/import HTTP/1.1\r\nHost: x\r\nContent-Type: ${kind === 'multipart' ? MULTIPART : 'text/csv'}\r\nContent-Length: ${Buffer.byteLength(body)}\r\n\r\n`
				);
				socket.write(body.slice(0, body.length / 2));
				setTimeout(() => socket.destroy(), 200);
			});
			socket.on('error', () => undefined);
			// Not a speed check: a request that never ends would leave this waiting for ever.
			const result = await Promise.race([
				outcome,
				new Promise((r) => setTimeout(() => r('still pending'), 5000))
			]);
			await new Promise((r) => setTimeout(r, 100));
			process.removeListener('uncaughtException', onUncaught);
			server.close();
			expect(result).toBe('returned 400');
			expect(uncaught).toEqual([]);
		});
	}

	it('fields that come after the file are refused by name, however late they arrive', async () => {
		const t = await makeTeam();
		const csv = fixture('materials/demo-library.csv');
		const lateMapping = [field('mapping', '{}'), end];
		for (const pause of [0, 300]) {
			const r = await send(t, MULTIPART, [...filePart(csv), ...lateMapping], { pauseBeforeLast: pause });
			expect(r.status).toBe(400);
			expect(r.json.message).toMatch(/mapping came after the file/);
		}
		const p = await send(t, MULTIPART, [...filePart(csv), end]);
		const c = await send(t, MULTIPART, [
			field('mode', 'commit'),
			...filePart(csv),
			field('token', p.json.token),
			end
		]);
		expect(c.status).toBe(400);
		expect(c.json.message).toMatch(/token came after the file/);
		const w = await send(t, MULTIPART, [
			field('mode', 'commit'),
			field('token', p.json.token),
			...filePart(csv),
			field('confirmWarnings', 'yes'),
			end
		]);
		expect(w.status).toBe(400);
		expect(w.json.message).toMatch(/confirmWarnings came after the file/);
		expect(
			Number((await tdb()('materials').where({ organisation_id: t.org.id }).count({ n: '*' }))[0].n)
		).toBe(0);
	});

	it('a slow file sent again with the commit holds no lock and no transaction while it arrives', async () => {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		let release!: () => void;
		const gate = new Promise<void>((r) => (release = r));
		async function* slow() {
			yield enc(`${HEAD}\n`);
			await gate; // the client is slow to send the rest
			yield enc('S-1,Board,insulation,0.035,declared\n');
		}
		const a = imp.commitMaterialsImport(db, actor, slow(), { token: 'not-the-token' }).catch((e: Error) => e);
		await new Promise((r) => setTimeout(r, 200));
		const idle = await tdb().raw(
			`SELECT count(*)::int AS n FROM pg_stat_activity WHERE datname = current_database() AND state LIKE 'idle in transaction%'`
		);
		const locks = await tdb().raw(`SELECT count(*)::int AS n FROM pg_locks WHERE locktype = 'advisory'`);
		expect(idle.rows[0].n).toBe(0);
		expect(locks.rows[0].n).toBe(0);
		// Another commit of the same organisation goes through meanwhile.
		const p = await imp.previewMaterialsImport(
			db,
			t.org.id,
			enc(`${HEAD}\nQ-1,Board,insulation,0.035,declared\n`)
		);
		if (p.kind !== 'preview') throw new Error('expected a preview');
		expect(
			await imp.commitMaterialsImport(db, actor, null, { token: p.token, confirmWarnings: true })
		).toMatchObject({ added: 1 });
		release();
		const refused = await a;
		expect(refused).toBeInstanceOf(ConflictError);
		expect((refused as ConflictError).status).toBe(409);
	});

	it('a material of the same code created while the commit runs: 409, and nothing of the import lands', async () => {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		const csv = `${HEAD}\nRACE-1,Board,insulation,0.035,declared\nRACE-2,Board,insulation,0.035,declared\n`;
		const p = await send(t, 'text/csv', [enc(csv)], { query: 'mode=preview' });
		expect(p.json.counts.new).toBe(2);
		const other = await db.transaction();
		await lib.insertNewMaterials(other, actor, [boardValues({ code: 'RACE-1' }) as never]);
		const commit = send(t, 'text/csv', [enc(csv)], {
			query: `mode=commit&token=${p.json.token}&confirmWarnings=yes`
		});
		await new Promise((r) => setTimeout(r, 300));
		await other.commit();
		const c = await commit;
		expect(c.status).toBe(409);
		expect(c.json.message).toMatch(/changed since the preview/);
		expect(await tdb()('materials').where({ organisation_id: t.org.id }).pluck('code')).toEqual(['RACE-1']);
	});

	it('a material created by hand while an import of the same code commits: the form gets a 409, not a 500', async () => {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		const p = await imp.previewMaterialsImport(
			db,
			t.org.id,
			enc(`${HEAD}\nHAND-1,Board,insulation,0.035,declared\n`)
		);
		if (p.kind !== 'preview') throw new Error('expected a preview');
		let release!: () => void;
		const held = new Promise<void>((r) => (release = r));
		let written!: () => void;
		const inside = new Promise<void>((r) => (written = r));
		// The import's transaction stays open (its log entry waits) while the form saves the same code.
		const importing = imp.commitMaterialsImport(
			db,
			actor,
			null,
			{ token: p.token, confirmWarnings: true },
			async () => {
				written();
				await held;
			}
		);
		await inside;
		const creating = lib
			.createMaterial(actor, boardValues({ code: 'HAND-1' }), { confirmWarnings: true })
			.catch((e: unknown) => e);
		await new Promise((r) => setTimeout(r, 200));
		release();
		expect(await importing).toMatchObject({ added: 1 });
		const err = (await creating) as AppError;
		expect(err).toBeInstanceOf(AppError);
		expect(err.status).toBe(409);
		expect(err.message).toBe('The code HAND-1 is already in the library.');
	});

	it('a material revised by hand while the commit runs: the commit waits, then is refused (409)', async () => {
		const t = await makeTeam();
		const actor = { userId: t.assessor.id, organisationId: t.org.id };
		const created = await lib.createMaterial(actor, boardValues({ code: 'RACE-3' }), {
			confirmWarnings: true
		});
		const csv = `${HEAD},mu_dry,density,specific_heat,source\nRACE-3,Board changed,insulation,0.035,declared,1,30,1030,Invented\n`;
		const p = await send(t, 'text/csv', [enc(csv)], { query: 'mode=preview' });
		expect(p.json.counts.changed).toBe(1);
		// An edit in its own transaction, holding the material's row as the edit form does.
		const other = await db.transaction();
		const locked = await other('materials')
			.where({ id: created.id })
			.forUpdate()
			.first('current_revision_id');
		const rev = await other('material_revisions').where({ id: locked.current_revision_id }).first();
		await lib.insertNewRevisions(other, actor, [
			{
				materialId: created.id,
				previousRevisionId: rev.id,
				revision: rev.revision,
				values: { ...lib.valuesOfRow({ ...rev, code: 'RACE-3' }), notes: 'by hand' }
			}
		]);
		const commit = send(t, 'text/csv', [enc(csv)], {
			query: `mode=commit&token=${p.json.token}&confirmWarnings=yes`
		});
		await new Promise((r) => setTimeout(r, 300));
		await other.commit();
		const c = await commit;
		expect(c.status).toBe(409);
		const revisions = await tdb()('material_revisions')
			.where({ material_id: created.id })
			.orderBy('revision');
		expect(revisions.map((r) => [r.revision, r.notes])).toEqual([
			[1, null],
			[2, 'by hand']
		]);
	});
});
