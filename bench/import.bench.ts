// Library import of 10,000 rows: the whole path a user takes (preview, then commit in one transaction),
// timed beside papaparse reading the same text alone in the same run (the floor).
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

function csv(n: number, prefix: string): string {
	const lines = [
		'code,name,manufacturer,category,lambda,lambda_kind,resistance,mu_dry,mu_wet,sd,density,specific_heat,thickness_min_mm,thickness_max_mm,source,source_issued,source_expires,indicative,notes'
	];
	for (let i = 0; i < n; i++) {
		const lambda = (0.03 + (i % 20) / 1000).toFixed(3);
		lines.push(
			`${prefix}-${String(i).padStart(6, '0')},"Board ${i}, rigid",Bench Products,insulation,${lambda},declared,,${1 + (i % 60)},,,${20 + (i % 50)},1030,20,300,Declaration of performance B-${i},2025-01-01,2030-01-01,no,`
		);
	}
	return lines.join('\n') + '\n';
}

const mb = (kb: number) => (kb / 1024).toFixed(0);
const ms = (t: number) => `${t.toFixed(0)} ms`;

const { previewMaterialsImport, commitMaterialsImport } = await import('../src/lib/server/csv/materials');
const { db, authPool } = await import('../src/lib/server/db');
const k = knex({ client: 'pg', connection: url });
try {
	const org = (
		await k('organisations')
			.insert({ name: `Bench ${Date.now()}`, slug: `bench-${Date.now()}` })
			.returning('id')
	)[0].id;
	const user = (
		await k('users')
			.insert({ email: `bench-${Date.now()}@example.test`, name: 'Bench' })
			.returning('id')
	)[0].id;
	const text = csv(ROWS, `B${Date.now().toString(36)}`);
	const bytes = new TextEncoder().encode(text);

	// Warm up both paths on a small file so JIT and connections do not count against either.
	const warm = new TextEncoder().encode(csv(200, 'WARM'));
	await previewMaterialsImport(db, org, warm);
	Papa.parse(text.slice(0, 20000), { step: () => {} });

	const rssBase = process.resourceUsage().maxRSS;
	let t = performance.now();
	let n = 0;
	Papa.parse<string[]>(text, { step: () => void n++ });
	const parseMs = performance.now() - t;
	const rssParse = process.resourceUsage().maxRSS;

	t = performance.now();
	const p = await previewMaterialsImport(db, org, bytes);
	const previewMs = performance.now() - t;
	if (p.kind !== 'preview' || p.counts.new !== ROWS)
		throw new Error(`unexpected preview: ${JSON.stringify(p).slice(0, 300)}`);
	t = performance.now();
	const s = await commitMaterialsImport(db, { userId: user, organisationId: org }, bytes, { token: p.token });
	const commitMs = performance.now() - t;
	if (s.added !== ROWS) throw new Error(`unexpected summary: ${JSON.stringify(s)}`);
	const rssImport = process.resourceUsage().maxRSS;
	const importMs = previewMs + commitMs;

	console.log(`file: ${ROWS} rows, ${(bytes.length / 1024 / 1024).toFixed(2)} MB`);
	console.log(
		`parse only (papaparse, floor): ${ms(parseMs)} (${n - 1} rows), peak RSS ${mb(rssParse)} MB (start ${mb(rssBase)} MB)`
	);
	console.log(`import preview: ${ms(previewMs)}; commit (re-read + write, one transaction): ${ms(commitMs)}`);
	console.log(`import total: ${ms(importMs)}  target < 3000 ms  ${importMs < 3000 ? 'ok' : 'MISSED'}`);
	console.log(
		`import peak RSS: ${mb(rssImport)} MB  target < 300 MB  ${rssImport / 1024 < 300 ? 'ok' : 'MISSED'}`
	);
	const ratio = importMs / parseMs;
	console.log(
		`import total / parse-only: ${ratio.toFixed(1)}×  target ≤ 5×  ${ratio <= 5 ? 'ok' : 'MISSED'}`
	);
	// For reading the figure: the preview reads the file once and validates every row; the commit reads it
	// again (the server keeps no state between the two) and writes 20,000 rows.
	console.log(`preview alone / parse-only: ${(previewMs / parseMs).toFixed(1)}×`);
	await k('organisations').where({ id: org }).delete();
} finally {
	await k.destroy();
	await db.destroy();
	await authPool.end();
}
