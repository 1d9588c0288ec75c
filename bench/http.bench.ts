// HTTP benchmarks on loopback: POST /api/v1/calculate and the dwelling page beside the trivial /healthz,
// on the same server. Needs BENCH_DATABASE_URL (migrated, demo-seeded) and a build in BENCH_BUILD_DIR (or
// ./build): `npm run bench -- http` prepares both. 20 connections (autocannon), 6 s per route, run as
// three interleaved rounds of 2 s (BENCH_ROUNDS, BENCH_SECONDS change them): each route's figures are the
// medians over its rounds, so a burst of load from other work on the shared machine falls on every route
// alike instead of on one. Short, so that the whole `npm run bench` stays short. Background workers are
// off in the server under test (ENVELO_NO_WORKERS=1): their polling is not what is measured.
// Targets: /calculate p99 < 50 ms and at least half the trivial route's throughput. /calculate is
// measured twice: with ?detail=summary (the figures and checks without the profile and the per-month
// Glaser arrays, a seventh of the bytes), which the target is read on, and with the full default answer.
import { spawn } from 'node:child_process';
import { createServer } from 'node:net';
import { randomBytes } from 'node:crypto';
import { cpus, loadavg } from 'node:os';
import knex from 'knex';
import autocannon from 'autocannon';

const DB_URL = process.env.BENCH_DATABASE_URL;
if (!DB_URL) {
	console.log('http bench skipped: set BENCH_DATABASE_URL (npm run bench prepares it)');
	process.exit(0);
}
const BUILD = process.env.BENCH_BUILD_DIR ?? 'build';
const CONNECTIONS = 20;
const DURATION = Number(process.env.BENCH_SECONDS ?? 2);
const ROUNDS = Number(process.env.BENCH_ROUNDS ?? 3);

const freePort = () =>
	new Promise<number>((resolve, reject) => {
		const s = createServer();
		s.listen(0, '127.0.0.1', () => {
			const port = (s.address() as { port: number }).port;
			s.close(() => resolve(port));
		});
		s.on('error', reject);
	});

const db = knex({ client: 'pg', connection: DB_URL, pool: { min: 0, max: 2 } });
const user = await db('users').where({ email: 'ben.okafor@northfield-retrofit.example.test' }).first('id');
if (!user) throw new Error('demo assessor missing: is the bench database seeded?');
const token = randomBytes(24).toString('hex');
await db('sessions').insert({
	userId: user.id,
	sessionToken: token,
	expires: new Date(Date.now() + 3600_000)
});
const dwelling = await db('dwellings')
	.where({ organisation_id: '00000000-0000-4000-8000-000000000001' })
	.orderBy('reference')
	.first('id', 'reference');
if (!dwelling) throw new Error('no demo dwelling: is seed 04 in place?');

const port = await freePort();
const origin = `http://127.0.0.1:${port}`;
const server = spawn('node', [BUILD], {
	env: {
		...process.env,
		DATABASE_URL: DB_URL,
		PORT: String(port),
		HOST: '127.0.0.1',
		ORIGIN: origin,
		AUTH_SECRET: process.env.AUTH_SECRET ?? 'bench-secret',
		ENVELO_NO_WORKERS: '1',
		// the per-member limit on calculations would answer most requests with a quick 429: what is
		// measured is the calculation itself
		CALCULATIONS_PER_MINUTE: '1000000000'
	},
	stdio: ['ignore', 'ignore', 'ignore']
});
const stop = () => {
	if (server.exitCode === null && server.signalCode === null) server.kill('SIGTERM');
};
// On any exit (an error included) the server goes too.
process.on('exit', () => {
	if (server.exitCode === null && server.signalCode === null) server.kill('SIGKILL');
});
for (let i = 0; ; i++) {
	try {
		if ((await fetch(`${origin}/healthz`)).ok) break;
	} catch {
		/* not up yet */
	}
	if (i > 100) throw new Error('server did not start');
	await new Promise((r) => setTimeout(r, 200));
}

const cookie = `authjs.session-token=${token}`;
// A bridged timber-frame wall with a 12-month climate: U, profile, fRsi and the Glaser cycle.
const climate = [-1, 0, 3, 6, 10, 13, 15, 15, 12, 8, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: 85
}));
const body = JSON.stringify({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
		{ name: 'Vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
		{
			name: 'Mineral wool between studs',
			thicknessMm: 140,
			lambda: 0.035,
			mu: 1,
			bridge: { lambda: 0.13, fraction: 0.15, mu: 50 }
		},
		{ name: 'OSB', thicknessMm: 9, lambda: 0.13, mu: 50 },
		{ name: 'Wood fibre board', thicknessMm: 60, lambda: 0.04, mu: 5 },
		{ name: 'Render', thicknessMm: 8, lambda: 1, mu: 10 }
	],
	internal: { temperature: 20, humidityClass: 3 },
	climate
});
const check = await fetch(`${origin}/api/v1/calculate?detail=summary`, {
	method: 'POST',
	headers: { cookie, 'content-type': 'application/json' },
	body
});
if (check.status !== 200)
	throw new Error(`/api/v1/calculate answered ${check.status}: ${await check.text()}`);
const page = await fetch(`${origin}/dwellings/${dwelling.id}`, { headers: { cookie } });
if (page.status !== 200) throw new Error(`dwelling page answered ${page.status}`);

type Run = { name: string; rps: number; p50: number; p99: number; non2xx: number };
type Route = {
	name: string;
	path: string;
	method?: 'GET' | 'POST';
	headers?: Record<string, string>;
	body?: string;
};
async function once(route: Route) {
	const { name, path, ...rest } = route;
	return autocannon({
		title: name,
		url: origin + path,
		connections: CONNECTIONS,
		duration: DURATION,
		...rest
	});
}
const median = (xs: number[]) => {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
};
const routes: Route[] = [
	{ name: 'GET /healthz (floor)', path: '/healthz' },
	{
		name: 'POST /api/v1/calculate?detail=summary',
		path: '/api/v1/calculate?detail=summary',
		method: 'POST',
		headers: { cookie, 'content-type': 'application/json' },
		body
	},
	{
		name: 'POST /api/v1/calculate (full)',
		path: '/api/v1/calculate',
		method: 'POST',
		headers: { cookie, 'content-type': 'application/json' },
		body
	},
	{
		name: `GET /dwellings/:id (${dwelling.reference})`,
		path: `/dwellings/${dwelling.id}`,
		headers: { cookie }
	}
];
const results = routes.map(() => [] as Awaited<ReturnType<typeof once>>[]);
for (let round = 0; round < ROUNDS; round++)
	for (let i = 0; i < routes.length; i++) results[i].push(await once(routes[i]));
const [trivial, calc, calcFull, dw]: Run[] = routes.map((route, i) => ({
	name: route.name,
	rps: median(results[i].map((r) => r.requests.average)),
	p50: median(results[i].map((r) => r.latency.p50)),
	p99: median(results[i].map((r) => r.latency.p99)),
	non2xx: results[i].reduce((a, r) => a + r.non2xx + r.errors, 0)
}));

console.log(
	`${CONNECTIONS} connections, ${ROUNDS} interleaved rounds of ${DURATION} s per route (medians), loopback, one server; load average ${loadavg()[0].toFixed(1)} on ${cpus().length} cores (the client shares them)`
);
for (const r of [trivial, calc, calcFull, dw]) {
	console.log(
		`${r.name.padEnd(40)} ${r.rps.toFixed(0).padStart(6)} req/s   p50 ${String(r.p50).padStart(4)} ms   p99 ${String(r.p99).padStart(4)} ms   non-2xx/errors ${r.non2xx}`
	);
}
const ratio = calc.rps / trivial.rps;
// Figures of a route that answered anything but 2xx measure the refusals, not the work: no verdict.
const clean = (r: { non2xx: number }) => r.non2xx === 0;
const verdict = (r: { non2xx: number }, ok: boolean) =>
	clean(r) ? (ok ? 'met' : 'NOT met') : `not measured (${r.non2xx} answers were not 2xx)`;
console.log(
	`calculate / trivial throughput ratio ${ratio.toFixed(2)} (target ≥ 0.50): ${verdict(calc, ratio >= 0.5)}`
);
console.log(`calculate p99 ${calc.p99} ms (target < 50 ms): ${verdict(calc, calc.p99 < 50)}`);
console.log(
	`full calculate answer: throughput ratio ${(calcFull.rps / trivial.rps).toFixed(2)}, p99 ${calcFull.p99} ms (read against the same targets: ${verdict(calcFull, calcFull.rps / trivial.rps >= 0.5 && calcFull.p99 < 50)})`
);
console.log(
	`dwelling page / trivial throughput ratio ${(dw.rps / trivial.rps).toFixed(2)} (target ≥ 0.25): ${verdict(dw, dw.rps / trivial.rps >= 0.25)}; p99 ${dw.p99} ms (target < 100 ms): ${verdict(dw, dw.p99 < 100)}`
);

await db('sessions').where({ sessionToken: token }).delete();
await db.destroy();
// Wait for the server to go before the database does (at most 5 s, then it is killed).
await new Promise<void>((resolve) => {
	if (server.exitCode !== null || server.signalCode !== null) return resolve();
	const kill = setTimeout(() => server.kill('SIGKILL'), 5000);
	server.once('exit', () => {
		clearTimeout(kill);
		resolve();
	});
	stop();
});
process.exit(0);
