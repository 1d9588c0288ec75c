// Two Envelo processes on one database, as behind a load balancer: the same ORIGIN and AUTH_SECRET, each
// on its own port. A sign-in link asked for on one is redeemed on the other and the session holds on
// both; a sign-out on one holds on the other within the identity cache's 5 s; an import previewed on one
// commits on the other (which reads the file again); and the recomputes of several batches are shared by
// the workers of both processes, each item counted once.
import { countMaterials, db, libraryCsv, seedIssuedDwellings } from './data.js';
import { secondsSince, sleep, waitFor } from './env.js';
import { ok, request, signInByMail } from './http.js';
import { outcome } from './outcome.js';
import { App, freePort } from './processes.js';
import { countedOnce, createBatch, finished, progressOf } from './recompute.js';

const IMPORT_ROWS = 5000;
// Runs long enough (a second or two each) that a worker busy with one leaves the next to the other.
const BATCHES = 6;
const BATCH_DWELLINGS = 2000;

/** Sign in on one, use it on both, sign out on the other. */
async function sessions(a, b, org) {
	const cookie = await signInByMail(a, b, org.assessor.email);
	const meA = await request(a, 'GET', '/api/v1/me', { cookie });
	const meB = await request(b, 'GET', '/api/v1/me', { cookie });
	const out = await request(b, 'POST', '/signout', {
		cookie,
		body: '',
		type: 'application/x-www-form-urlencoded',
		accept: 'text/html'
	});
	const t = performance.now();
	const refused = await waitFor(
		'the sign-out to hold on the other process',
		async () => (await request(a, 'GET', '/api/v1/me', { cookie })).status === 401,
		15_000,
		100
	).catch(() => false);
	return {
		both:
			meA.status === 200 &&
			meB.status === 200 &&
			meA.json?.user?.email === org.assessor.email &&
			meB.json?.user?.email === org.assessor.email,
		signedOut: out.status < 400 && refused,
		text: `sign-in link asked on A, redeemed on B: /api/v1/me ${meA.status} on A, ${meB.status} on B; signed out on B (${out.status}), A refuses the session ${secondsSince(t)} s later`
	};
}

/** Preview on A, commit on B: without the file (B keeps no preview: 409), then with it. */
async function importAcross(a, b, org) {
	const csv = libraryCsv('TWO-', IMPORT_ROWS);
	const path = (q) => `/api/v1/materials/import?${new URLSearchParams(q)}`;
	const preview = await ok(a, 'POST', path({ mode: 'preview' }), {
		cookie: org.assessor.cookie,
		body: csv,
		type: 'text/csv',
		timeoutMs: 120_000
	});
	const commitQuery = { mode: 'commit', token: preview.token, confirmWarnings: 'yes' };
	// the form's fields without its file
	const boundary = 'faults-boundary';
	const fields = Object.entries(commitQuery).map(
		([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`
	);
	const bare = await request(b, 'POST', '/api/v1/materials/import', {
		cookie: org.assessor.cookie,
		body: `${fields.join('')}--${boundary}--\r\n`,
		type: `multipart/form-data; boundary=${boundary}`
	});
	const committed = await request(b, 'POST', path(commitQuery), {
		cookie: org.assessor.cookie,
		body: csv,
		type: 'text/csv',
		timeoutMs: 120_000
	});
	const rows = await countMaterials(org.orgId, 'TWO-');
	return {
		ok:
			committed.status === 200 &&
			committed.json?.added === IMPORT_ROWS &&
			rows === IMPORT_ROWS &&
			bare.status === 409,
		text: `${IMPORT_ROWS} rows previewed on A; commit on B with the token only: ${bare.status} (B keeps no preview), with the file again: ${committed.status}, ${committed.json?.added} added, ${rows} in the database`
	};
}

/** Which process runs recompute queries right now, by the name of its database sessions. */
async function sampleRecomputes(samples) {
	const { rows } = await db.raw(
		`SELECT application_name AS app, count(*)::int AS n FROM pg_stat_activity
		 WHERE state = 'active' AND application_name LIKE 'envelo-%'
		   AND (query ILIKE '%jsonb_to_recordset%' OR query ILIKE '%from "elements"%' OR query ILIKE '%audit_items%')
		 GROUP BY application_name`
	);
	for (const r of rows) samples[r.app] = (samples[r.app] ?? 0) + r.n;
}

/** Batches created on A and B in turn; both workers recompute; each item counted once. */
async function sharedRecompute(a, b, org) {
	for (let i = 0; i < BATCHES; i++) await seedIssuedDwellings(org, `two${i}`, BATCH_DWELLINGS);
	const cpu0 = [a.cpuSeconds(), b.cpuSeconds()];
	const t = performance.now();
	const batches = [];
	for (let i = 0; i < BATCHES; i++) batches.push(await createBatch(i % 2 ? b : a, org, `two${i}`));
	const samples = {};
	let running = true;
	const sampler = (async () => {
		while (running) {
			await sampleRecomputes(samples).catch(() => null);
			await sleep(100);
		}
	})();
	for (const batch of batches) await finished(batch.id, 240_000);
	running = false;
	await sampler;
	const cpu = [a.cpuSeconds() - cpu0[0], b.cpuSeconds() - cpu0[1]];
	const checks = await Promise.all(batches.map((x) => countedOnce(x.id)));
	const problems = checks.flatMap((c) => c.problems);
	// Each run writes the process that holds it on the batch (progress.runner, "host:pid").
	const runners = await Promise.all(batches.map(async (x) => (await progressOf(x.id)).runner ?? ''));
	const ran = (app) => runners.filter((r) => r.endsWith(`:${app.pid}`)).length;
	const tookPart = (app) => ran(app) > 0;
	return {
		ok: problems.length === 0 && tookPart(a) && tookPart(b),
		problems,
		text: `${BATCHES} batches × ${BATCH_DWELLINGS} dwellings created on A and B in turn, all done in ${secondsSince(t)} s; ${checks.reduce((s, c) => s + c.items, 0)} items, ${checks.reduce((s, c) => s + c.logRows, 0)} recompute rows (one each); CPU while they ran: A ${cpu[0].toFixed(1)} s, B ${cpu[1].toFixed(1)} s; batches run by A ${ran(a)}, by B ${ran(b)}; recompute queries seen: A ${samples['envelo-a'] ?? 0}, B ${samples['envelo-b'] ?? 0}`
	};
}

export async function twoApps({ app, org }) {
	const t0 = performance.now();
	const b = new App('b', await freePort(), app.origin);
	await b.start();
	try {
		const s = await sessions(app, b, org);
		const imp = await importAcross(app, b, org);
		const rec = await sharedRecompute(app, b, org);
		return outcome(
			'Two Envelo processes, one database',
			`a second Envelo process (B, port ${b.port}) beside A (port ${app.port}), both answering as ${app.origin} with the same AUTH_SECRET`,
			`${s.text}. ${imp.text}. ${rec.text}`,
			[
				[s.both, 'the session did not hold on both processes'],
				[s.signedOut, 'the sign-out on B did not hold on A within 15 s'],
				[imp.ok, 'the import previewed on A did not commit on B as expected'],
				[rec.ok, rec.problems.join('; ') || 'one of the processes did no recompute']
			],
			secondsSince(t0)
		);
	} finally {
		await b.stop();
	}
}
