// Library import of 10,000 rows: the whole path a user takes (preview of the streamed upload, then commit
// in one transaction), timed beside two floors measured in the same run: papaparse reading the same text
// alone, and PostgreSQL alone writing as many rows into the same tables.
// Targets: import under 3 s, peak memory under 300 MB, within 5× of the parse-only floor.
import { register } from 'node:module';
import Papa from 'papaparse';
import knex from 'knex';

// Outside SvelteKit: stand in for its two virtual modules that the server code imports.
register(
	'data:text/javascript,' +
		encodeURIComponent(`
export async function resolve(spec, ctx, next) {
	if (spec === '$app/environment') return { url: 'data:text/javascript,export const building=false,dev=false,browser=false;', shortCircuit: true };
	if (spec === '$env/dynamic/private') return { url: 'data:text/javascript,export const env=process.env;', shortCircuit: true };
	return next(spec, ctx);
}`)
);

const ROWS = 10_000;
const url = process.env.BENCH_DATABASE_URL ?? process.env.DATABASE_URL;
if (!url) {
	console.log('import bench: skipped (no BENCH_DATABASE_URL; run ./docker-free-start.sh bench)');
	process.exit(0);
}
process.env.DATABASE_URL = url;

const HEADER =
	'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes';
function row(i: number, prefix: string): string {
	const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
	return `${prefix}-${String(i).padStart(6, '0')},"Board ${i}, rigid",Bench Products,insulation,${lambda},declared,,${1 + (i % 60)},,,${20 + (i % 50)},1030,20,300,Declaration of performance B-${i},2025-01-01,2030-01-01,no,`;
}
function csv(n: number, prefix: string): string {
	const lines = [HEADER];
	for (let i = 0; i < n; i++) lines.push(row(i, prefix));
	return lines.join('\n') + '\n';
}

const mb = (kb: number) => (kb / 1024).toFixed(0);
const ms = (t: number) => `${t.toFixed(0)} ms`;

const { previewMaterialsImport, commitMaterialsImport, forgetKeptPreviews } =
	await import('../src/lib/server/library/import');
const { readCsvStream } = await import('../src/lib/server/csv/read');
const { db, authPool } = await import('../src/lib/server/db');
const k = knex({ client: 'pg', connection: url });
try {
	const org = (
		await k('organisations')
			.insert({ name: `Bench ${Date.now()}`, slug: `bench-${Date.now()}` })
			.returning('id')
	)[0].id;
	async function writeFloor(rows: number): Promise<number> {
		const trx = await k.transaction();
		try {
			const started = performance.now();
			await trx.raw(
				`CREATE TEMP TABLE floor_ids ON COMMIT DROP AS
				 SELECT gen_random_uuid() AS m, gen_random_uuid() AS r, i FROM generate_series(1, ?) AS i`,
				[rows]
			);
			await trx.raw(
				`INSERT INTO materials (id, organisation_id, code, current_revision_id)
				 SELECT m, ?, 'FLOOR-' || i, r FROM floor_ids`,
				[org]
			);
			await trx.raw(
				`INSERT INTO material_revisions (id, organisation_id, material_id, revision, name, manufacturer,
				   category, lambda, lambda_kind, mu_dry, density, specific_heat, thickness_min_mm, thickness_max_mm,
				   source, source_issued, source_expires, indicative, status, created_by)
				 SELECT r, ?, m, 1, 'Board ' || i || ', rigid', 'Bench Products', 'insulation', 0.03 + (i % 20) / 1000.0,
				   'declared', 1 + i % 60, 20 + i % 50, 1030, 20, 300, 'Declaration of performance B-' || i,
				   '2025-01-01', '2030-01-01', false, 'unverified', ?
				 FROM floor_ids`,
				[org, user]
			);
			await trx.raw('SET CONSTRAINTS ALL IMMEDIATE'); // the deferred key is checked here, as at commit
			return performance.now() - started;
		} finally {
			await trx.rollback();
		}
	}
	const user = (
		await k('users')
			.insert({ email: `bench-${Date.now()}@example.test`, name: 'Bench' })
			.returning('id')
	)[0].id;
	const text = csv(ROWS, `B${Date.now().toString(36)}`);
	const bytes = new TextEncoder().encode(text);
	// The upload as the server receives it: 64 KB chunks of a stream, never the whole file at once.
	async function* upload(b: Uint8Array) {
		for (let i = 0; i < b.length; i += 64 * 1024) yield b.subarray(i, i + 64 * 1024);
	}

	// Warm up every path on a small file so JIT and connections do not count against any of them.
	const warmText = csv(200, 'WARM');
	const warm = new TextEncoder().encode(warmText);
	const wp = await previewMaterialsImport(db, org, upload(warm));
	if (wp.kind === 'preview')
		await commitMaterialsImport(db, { userId: user, organisationId: org }, null, { token: wp.token });
	Papa.parse(text.slice(0, 20000), { step: () => {} });
	await writeFloor(200);

	const rssBase = process.resourceUsage().maxRSS;
	let t = performance.now();
	let n = 0;
	Papa.parse<string[]>(text, { step: () => void n++ });
	const parseMs = performance.now() - t;
	const rssParse = process.resourceUsage().maxRSS;

	// The second floor: PostgreSQL alone writing as many materials and first revisions, with the same
	// keys, constraints and triggers, from rows it makes itself (no client, no parsing); rolled back.
	const writeMs = await writeFloor(ROWS);

	t = performance.now();
	const p = await previewMaterialsImport(db, org, upload(bytes));
	const previewMs = performance.now() - t;
	if (p.kind !== 'preview' || p.counts.new !== ROWS)
		throw new Error(`unexpected preview: ${JSON.stringify(p).slice(0, 300)}`);
	t = performance.now();
	const s = await commitMaterialsImport(db, { userId: user, organisationId: org }, upload(bytes), {
		token: p.token
	});
	const commitMs = performance.now() - t;
	if (s.added !== ROWS) throw new Error(`unexpected summary: ${JSON.stringify(s)}`);
	const rssImport = process.resourceUsage().maxRSS;
	const importMs = previewMs + commitMs;

	// A commit that finds no kept preview (the server restarted in between) reads the file again.
	const text2 = csv(ROWS, `C${Date.now().toString(36)}`);
	const bytes2 = new TextEncoder().encode(text2);
	const p2 = await previewMaterialsImport(db, org, upload(bytes2));
	if (p2.kind !== 'preview') throw new Error('unexpected preview');
	forgetKeptPreviews();
	t = performance.now();
	await commitMaterialsImport(db, { userId: user, organisationId: org }, upload(bytes2), { token: p2.token });
	const rereadMs = performance.now() - t;

	// Memory stays flat while a file near the size limit streams through the reader: the heap is sampled
	// as rows go by (the rows themselves are dropped here; the preview keeps only what it shows).
	async function* bigUpload(rows: number) {
		// made as it is sent, 400 rows at a time: the whole file never exists in this process
		const enc = new TextEncoder();
		yield enc.encode(HEADER + '\n');
		for (let i = 0; i < rows; i += 400) {
			let part = '';
			for (let j = i; j < Math.min(rows, i + 400); j++) part += row(j, 'BIG') + '\n';
			yield enc.encode(part);
		}
	}
	async function streamedRead(rows: number): Promise<{ bytes: number; growth: number }> {
		globalThis.gc?.();
		const heapStart = process.memoryUsage().heapUsed;
		let heapPeak = heapStart;
		let bytes = 0;
		await readCsvStream(
			(async function* () {
				for await (const c of bigUpload(rows)) {
					bytes += c.length;
					yield c;
				}
			})(),
			{},
			() => {},
			(_cells, line) => {
				if (line % 500 === 0) heapPeak = Math.max(heapPeak, process.memoryUsage().heapUsed);
			}
		);
		return { bytes, growth: heapPeak - heapStart };
	}
	const quarter = await streamedRead(15_500);
	const nearLimit = await streamedRead(62_000);

	console.log(`file: ${ROWS} rows, ${(bytes.length / 1024 / 1024).toFixed(2)} MB`);
	console.log(
		`floor 1, parse only (papaparse on the same text): ${ms(parseMs)} (${n - 1} rows), peak RSS ${mb(rssParse)} MB (start ${mb(rssBase)} MB)`
	);
	console.log(
		`floor 2, PostgreSQL alone writing ${ROWS} materials + ${ROWS} revisions (same constraints): ${ms(writeMs)}`
	);
	console.log(
		`import: preview (streamed read, validation, comparison) ${ms(previewMs)}; commit (kept preview, one transaction) ${ms(commitMs)}`
	);
	console.log(`import total: ${ms(importMs)}  target < 3000 ms  ${importMs < 3000 ? 'ok' : 'MISSED'}`);
	console.log(
		`import peak RSS: ${mb(rssImport)} MB  target < 300 MB  ${rssImport / 1024 < 300 ? 'ok' : 'MISSED'}`
	);
	const ratio = importMs / parseMs;
	console.log(
		`import total / parse-only: ${ratio.toFixed(1)}×  target ≤ 5×  ${ratio <= 5 ? 'ok' : 'MISSED'}`
	);
	// For reading the figure: the write floor alone is this many parse floors, so no import that stores
	// its rows can come within 5× of parsing; the ratio to both floors shows what the import adds.
	console.log(`write floor / parse-only: ${(writeMs / parseMs).toFixed(1)}×`);
	console.log(`import total / (parse + write floors): ${(importMs / (parseMs + writeMs)).toFixed(2)}×`);
	console.log(`preview alone / parse-only: ${(previewMs / parseMs).toFixed(1)}×`);
	console.log(`commit without a kept preview (reads the file again): ${ms(rereadMs)}`);
	const mbOf = (b: number) => (b / 1024 / 1024).toFixed(1);
	console.log(
		`streamed read, rows not kept: ${mbOf(quarter.bytes)} MB file → peak heap growth ${mbOf(quarter.growth)} MB; ${mbOf(nearLimit.bytes)} MB file → ${mbOf(nearLimit.growth)} MB (flat when the two are alike)`
	);
	await k('organisations').where({ id: org }).delete();
} finally {
	await k.destroy();
	await db.destroy();
	await authPool.end();
}
