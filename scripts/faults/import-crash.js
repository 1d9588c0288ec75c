// Envelo killed (kill -9) while it commits a CSV import of the material library: the commit is one
// transaction, so afterwards either none of the file's rows are in or all of them, never some. The
// kill comes at several points of a commit whose length is first measured without one; a commit that
// lost its process is then sent again to the restarted process and lands whole.
import { countMaterials, db, libraryCsv, sessionsGone } from './data.js';
import { secondsSince, sleep, waitFor } from './env.js';
import { ok, request } from './http.js';
import { outcome } from './outcome.js';

const ROWS = 40_000;
const FRACTIONS = [0.15, 0.5, 0.85];

const importPath = (query) => `/api/v1/materials/import?${new URLSearchParams(query)}`;

async function preview(app, org, csv) {
	const p = await ok(app, 'POST', importPath({ mode: 'preview' }), {
		cookie: org.assessor.cookie,
		body: csv,
		type: 'text/csv',
		timeoutMs: 120_000
	});
	if (p.kind !== 'preview' || p.counts.new !== ROWS)
		throw new Error(`the preview saw ${JSON.stringify(p.counts)}`);
	return p.token;
}

function commit(app, org, csv, token) {
	return request(app, 'POST', importPath({ mode: 'commit', token, confirmWarnings: 'yes' }), {
		cookie: org.assessor.cookie,
		body: csv,
		type: 'text/csv',
		timeoutMs: 120_000
	});
}

/** The app's transaction that writes the import, as PostgreSQL shows it (the app role sees its own). */
async function commitRunning(appName) {
	const { rows } = await db.raw(
		`SELECT count(*)::int AS n FROM pg_stat_activity
		 WHERE application_name = ? AND xact_start IS NOT NULL AND state <> 'idle'
		   AND (query ILIKE '%material%' OR query ILIKE '%advisory%')`,
		[appName]
	);
	return rows[0].n > 0;
}

/** One commit killed `afterMs` into its transaction; how many of the rows are in afterwards. */
async function killedCommit(app, org, prefix, afterMs) {
	const csv = libraryCsv(prefix, ROWS);
	const token = await preview(app, org, csv);
	const appName = `envelo-${app.name}`;
	const sent = commit(app, org, csv, token).then(
		(r) => ({ answered: r.status }),
		() => ({ answered: null })
	);
	await waitFor('the commit transaction', () => commitRunning(appName), 60_000, 20);
	await sleep(afterMs);
	await app.kill9();
	const { answered } = await sent;
	await sessionsGone(app);
	const rows = await countMaterials(org.orgId, prefix);
	const revisions = await countRevisions(org.orgId, prefix);
	await app.start();
	return { prefix, csv, token, rows, revisions, answered, afterMs };
}

async function countRevisions(orgId, prefix) {
	const [{ n }] = await db('material_revisions as r')
		.join('materials as m', 'm.id', 'r.material_id')
		.where('m.organisation_id', orgId)
		.andWhere('m.code', 'like', `${prefix}%`)
		.count({ n: '*' });
	return Number(n);
}

export async function importCrash({ app, org }) {
	const t0 = performance.now();
	// The commit's length without a kill, for where to put the kills.
	const csv = libraryCsv('CAL-', ROWS);
	const token = await preview(app, org, csv);
	const tc = performance.now();
	const plain = await commit(app, org, csv, token);
	const commitMs = performance.now() - tc;
	const plainRows = await countMaterials(org.orgId, 'CAL-');

	const kills = [];
	for (const [i, f] of FRACTIONS.entries())
		kills.push(await killedCommit(app, org, `KILL${i}-`, Math.round(f * commitMs)));
	// A commit that lost its process, sent again with its file and token to the restarted process.
	const lostOne = kills.find((k) => k.rows === 0);
	let retried = null;
	if (lostOne) {
		const r = await commit(app, org, lostOne.csv, lostOne.token);
		retried = { status: r.status, rows: await countMaterials(org.orgId, lostOne.prefix) };
	}
	const some = kills.filter((k) => k.rows !== 0 && k.rows !== ROWS);
	const torn = kills.filter((k) => k.revisions !== k.rows);
	const figures =
		`${ROWS} rows a file (${(csv.length / 1e6).toFixed(1)} MB); commit without a kill ${(commitMs / 1000).toFixed(1)} s, answered ${plain.status}, ${plainRows} rows in; ` +
		kills
			.map((k) => `killed ${(k.afterMs / 1000).toFixed(1)} s into the commit: ${k.rows} rows in`)
			.join('; ') +
		(retried
			? `; the lost commit sent again after the restart: ${retried.status}, ${retried.rows} rows in`
			: '; every kill came after the commit had finished');
	return outcome(
		'Envelo killed during a CSV import commit',
		`library CSV preview, then commit (POST /api/v1/materials/import) with kill -9 of Envelo at ${FRACTIONS.map((f) => `${f * 100} %`).join(', ')} of the commit's length; Envelo started again each time`,
		figures,
		[
			[plain.status === 200 && plainRows === ROWS, 'the commit without a kill did not import every row'],
			[some.length === 0, `${some.map((k) => k.rows).join(', ')} rows in: part of a file`],
			[torn.length === 0, 'a material without its revision, or the other way round'],
			[kills.some((k) => k.rows === 0), 'no kill landed inside the commit (it was too quick to catch)'],
			[
				!retried || (retried.status === 200 && retried.rows === ROWS),
				'the commit sent again did not import every row'
			]
		],
		secondsSince(t0)
	);
}
