// Demo reports: issue dwelling reports for most of Northfield's twelve demo dwellings (seed 04), through
// the running app's own API, so numbers, PDFs, SHA-256 hashes, verification codes and snapshots are
// made by the real issuing code. Run once by docker-free-start.sh after the server answers /healthz:
//   node scripts/demo-reports.js http://127.0.0.1:3000
// It signs each demo assessor in with a short-lived session row, POSTs /api/v1/reports for each of their
// demo dwellings that has no report yet, and deletes the session rows again (also on failure).
// Idempotent: a dwelling with any report is left alone, so a second start issues nothing new.
// LT-006, LT-011 and LT-012 stay drafts on purpose (something to issue by hand in the demo).
import knex from 'knex';
import { randomBytes } from 'node:crypto';

const NORTHFIELD = '00000000-0000-4000-8000-000000000001';
/** Demo dwellings that start issued (the rest of LT-001…LT-012 stay drafts). */
const ISSUED = ['LT-001', 'LT-002', 'LT-003', 'LT-004', 'LT-005', 'LT-007', 'LT-008', 'LT-009', 'LT-010'];
const SESSION_MINUTES = 10;

const base = (process.argv[2] ?? `http://127.0.0.1:${process.env.PORT ?? 3000}`).replace(/\/$/, '');
const log = (/** @type {string} */ msg) => console.log(`[envelo] demo reports: ${msg}`);

async function main() {
	if (!process.env.DATABASE_URL) throw new Error('DATABASE_URL is not set');
	const db = knex({ client: 'pg', connection: process.env.DATABASE_URL, pool: { min: 0, max: 2 } });
	/** @type {string[]} */
	const tokens = [];
	let issued = 0;
	let failed = 0;
	try {
		const todo = await db('dwellings as d')
			.where('d.organisation_id', NORTHFIELD)
			.whereIn('d.reference', ISSUED)
			.whereNotNull('d.assessor_id')
			.where('d.status', 'draft')
			.whereNotExists(db('reports as r').whereRaw('r.dwelling_id = d.id').select(db.raw('1')))
			.orderBy('d.reference')
			.select('d.id', 'd.reference', 'd.assessor_id');
		if (todo.length === 0) {
			log('nothing to issue');
			return;
		}
		/** @type {Map<string, string>} assessor id → session token */
		const sessions = new Map();
		for (const d of todo) {
			if (sessions.has(d.assessor_id)) continue;
			const token = `demo-${randomBytes(24).toString('hex')}`;
			await db('sessions').insert({
				userId: d.assessor_id,
				sessionToken: token,
				expires: new Date(Date.now() + SESSION_MINUTES * 60_000)
			});
			tokens.push(token);
			sessions.set(d.assessor_id, token);
		}
		for (const d of todo) {
			const res = await fetch(`${base}/api/v1/reports`, {
				method: 'POST',
				headers: {
					'content-type': 'application/json',
					cookie: `authjs.session-token=${sessions.get(d.assessor_id)}`
				},
				body: JSON.stringify({ dwellingId: d.id })
			});
			const body = await res.json().catch(() => ({}));
			if (res.status === 201) {
				issued++;
				log(`${d.reference} issued as ${body.number} revision ${body.revision}`);
			} else {
				failed++;
				const issues = (body.issues ?? []).map((/** @type {any} */ i) =>
					typeof i === 'string' ? i : `${i.path}: ${i.message}`
				);
				const why = [body.message, ...issues].filter(Boolean).join(' ');
				log(`${d.reference} not issued (HTTP ${res.status}): ${why || 'no reason given'}`);
			}
		}
		log(`${issued} issued, ${failed} refused`);
	} finally {
		if (tokens.length) await db('sessions').whereIn('sessionToken', tokens).del();
		await db.destroy();
	}
	if (failed) process.exitCode = 1;
}

main().catch((e) => {
	console.error(`[envelo] demo reports failed: ${e instanceof Error ? e.message : String(e)}`);
	process.exitCode = 1;
});
