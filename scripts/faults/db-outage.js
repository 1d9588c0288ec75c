// PostgreSQL restarted (pg_ctl restart -m fast) and then crashed (kill -9 of the postmaster) while
// writers create dwellings and elements through the HTTP API. Every write Envelo acknowledged (201) must
// be in the database afterwards; while the database is down the answer is 503 with Retry-After; and the
// same Envelo process takes writes again once PostgreSQL is back, without a restart.
import { db, wallBody } from './data.js';
import { secondsSince, sleep, waitFor } from './env.js';
import { ok, request } from './http.js';
import { outcome } from './outcome.js';
import { pg } from './processes.js';

const WRITERS = 6;

/** Writers in a loop until stopped, each answer counted under the phase it came in. */
function startLoad(app, org, dwellingId) {
	const load = {
		phase: 'before',
		running: true,
		acked: { dwellings: [], elements: [] },
		by: {},
		noAnswer: 0
	};
	load.by.before = {};
	const count = (key) => {
		const p = (load.by[load.phase] ??= {});
		p[key] = (p[key] ?? 0) + 1;
	};
	const writer = async (w) => {
		for (let n = 0; load.running; n++) {
			const dwelling = (w + n) % 2 === 0;
			const path = dwelling ? '/api/v1/dwellings' : `/api/v1/dwellings/${dwellingId}/elements`;
			const json = dwelling ? { reference: `LOAD-${w}-${n}` } : wallBody(`Load ${w}-${n}`);
			try {
				const r = await request(app, 'POST', path, { cookie: org.assessor.cookie, json, timeoutMs: 30_000 });
				if (r.status === 201) load.acked[dwelling ? 'dwellings' : 'elements'].push(r.json.id);
				count(
					r.status === 503
						? r.headers['retry-after']
							? '503+Retry-After'
							: '503 without Retry-After'
						: String(r.status)
				);
				if (r.status !== 201) await sleep(50);
			} catch {
				load.noAnswer++;
				count('no answer');
				await sleep(50);
			}
		}
	};
	load.done = Promise.all(Array.from({ length: WRITERS }, (_, w) => writer(w)));
	return load;
}

/** What a signed-in read answers while the database is down, for `ms`. */
async function probeWhileDown(app, org, ms) {
	const seen = {};
	const until = Date.now() + ms;
	while (Date.now() < until) {
		const r = await request(app, 'GET', '/api/v1/dwellings', { cookie: org.assessor.cookie }).catch(
			() => null
		);
		const key = !r
			? 'no answer'
			: r.status === 503 && r.headers['retry-after']
				? `503 (Retry-After: ${r.headers['retry-after']})`
				: String(r.status);
		seen[key] = (seen[key] ?? 0) + 1;
		await sleep(100);
	}
	return seen;
}

const show = (o) =>
	Object.entries(o ?? {})
		.map(([k, v]) => `${k}×${v}`)
		.join(', ') || 'none';

async function missing(table, ids) {
	if (!ids.length) return 0;
	const [{ n }] = await db(table).whereIn('id', ids).count({ n: '*' });
	return ids.length - Number(n);
}

export async function dbOutage({ app, org }) {
	const t0 = performance.now();
	const target = await ok(app, 'POST', '/api/v1/dwellings', {
		cookie: org.assessor.cookie,
		json: { reference: 'LOAD-ELEMENTS' }
	});
	const pid = app.pid;
	const load = startLoad(app, org, target.id);
	await sleep(3000);
	load.phase = 'restart';
	const tr = performance.now();
	await pg.restart();
	const restartSeconds = secondsSince(tr);
	load.phase = 'between';
	await sleep(3000);
	load.phase = 'down';
	const td = performance.now();
	pg.crash();
	const probes = await probeWhileDown(app, org, 4000);
	await pg.start();
	const downSeconds = secondsSince(td);
	load.phase = 'after';
	const back = performance.now();
	const before = load.acked.dwellings.length + load.acked.elements.length;
	await waitFor(
		'an acknowledged write after the crash',
		() => load.acked.dwellings.length + load.acked.elements.length > before,
		30_000,
		50
	).catch(() => null);
	const firstWrite = secondsSince(back);
	await sleep(4000);
	load.running = false;
	await load.done;

	const acked = load.acked.dwellings.length + load.acked.elements.length;
	const lost =
		(await missing('dwellings', load.acked.dwellings)) + (await missing('elements', load.acked.elements));
	const all = Object.values(load.by).flatMap((p) => Object.entries(p));
	const other5xx = all.filter(([k]) => /^5\d\d$/.test(k)).reduce((s, [, v]) => s + v, 0);
	const bare503 = all.filter(([k]) => k === '503 without Retry-After').reduce((s, [, v]) => s + v, 0);
	const downs = Object.entries(probes)
		.filter(([k]) => k.startsWith('503 ('))
		.reduce((s, [, v]) => s + v, 0);
	const afterOk = load.by.after?.['201'] ?? 0;
	const figures =
		`${acked} writes acknowledged (${load.acked.dwellings.length} dwellings, ${load.acked.elements.length} elements), ${acked - lost} of them found afterwards; ` +
		`restart took ${restartSeconds} s, down after kill -9 ${downSeconds} s (crash recovery included); ` +
		`answers during the restart: ${show(load.by.restart)}; while down: ${show(load.by.down)}; reads while down: ${show(probes)}; ` +
		`after: ${show(load.by.after)}, first acknowledged write ${firstWrite} s after PostgreSQL was back; same Envelo process (pid ${pid})`;
	return outcome(
		'PostgreSQL restart and crash under write load',
		`${WRITERS} writers POSTing dwellings and elements; pg_ctl restart -m fast, then kill -9 of the postmaster, down ~4 s, pg_ctl start`,
		figures,
		[
			[lost === 0, `${lost} acknowledged write(s) missing`],
			[downs > 0, 'no 503 with Retry-After while the database was down'],
			[bare503 === 0, `${bare503} answer(s) 503 without Retry-After`],
			[other5xx === 0, `${other5xx} other 5xx answer(s)`],
			[load.noAnswer === 0, `${load.noAnswer} request(s) got no answer`],
			[afterOk > 0, 'no write succeeded after PostgreSQL was back'],
			[app.alive && app.pid === pid, 'Envelo had to be restarted']
		],
		secondsSince(t0)
	);
}
