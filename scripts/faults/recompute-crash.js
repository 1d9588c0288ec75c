// Envelo killed in the middle of an audit batch's recompute. After the restart the batch is found
// stalled (its heartbeat stopped half a minute before) and continued where the killed run stopped: it finishes,
// and every item is counted once.
import { db, seedIssuedDwellings, sessionsGone } from './data.js';
import { secondsSince, waitFor } from './env.js';
import { outcome } from './outcome.js';
import { countedOnce, createBatch, finished, progressOf } from './recompute.js';

const DWELLINGS = 2400;
/** Resumes within a minute: stalled 30 s after its last heartbeat (beats every 5 s), looked for every 5 s. */
const RESUME_BOUND_S = 60;

export async function recomputeCrash({ app, org }) {
	const t0 = performance.now();
	await seedIssuedDwellings(org, 'recompute', DWELLINGS);
	const batch = await createBatch(app, org, 'recompute');
	// Kill once two chunks are written and more than one is left.
	const atKill = await waitFor(
		'the recompute to be under way',
		async () => {
			const p = await progressOf(batch.id);
			if (p.state === 'done') throw new Error('the recompute finished before it could be interrupted');
			return p.state === 'running' && p.done >= 400 && p.done <= DWELLINGS - 400 ? p : null;
		},
		180_000,
		50
	);
	const tk = performance.now();
	await app.kill9();
	await sessionsGone(app);
	const killedAt = (await progressOf(batch.id)).done;
	await app.start();
	const restartedAfter = secondsSince(tk);
	const resumed = await waitFor(
		'the batch to be taken over',
		async () => {
			const p = await progressOf(batch.id);
			return p.resumedAt || p.state === 'done' ? p : null;
		},
		150_000,
		250
	);
	const resumedAfter = Number(secondsSince(tk));
	const done = await finished(batch.id, 180_000);
	const check = await countedOnce(batch.id);
	const log = await db('activity_log')
		.where({ action: 'audit-batch-recompute', entity: 'audit_batch', entity_id: batch.id })
		.first('details');
	const continuedFrom = log?.details?.continuedFrom ?? 0;
	const figures =
		`${DWELLINGS} dwellings × 3 elements; killed at ${killedAt}/${DWELLINGS} done (seen ${atKill.done}); Envelo up again ${restartedAfter} s after the kill; ` +
		`the batch taken over ${resumedAfter.toFixed(1)} s after the kill and continued from ${continuedFrom}; finished ${secondsSince(tk)} s after the kill; ` +
		`${check.items} items, ${check.logRows} recompute rows in the log (one each), ${check.flagged} flagged, progress ${done.done}/${done.total}`;
	return outcome(
		'Envelo killed during a batch recompute',
		`audit batch of ${DWELLINGS} issued dwellings created through the API; kill -9 of Envelo mid-run; start again`,
		figures,
		[
			[Boolean(resumed.resumedAt), 'the batch finished without being taken over'],
			[
				resumedAfter <= RESUME_BOUND_S,
				`taken over ${resumedAfter.toFixed(1)} s after the kill, later than ${RESUME_BOUND_S} s`
			],
			[
				continuedFrom > 0 && continuedFrom === killedAt,
				`continued from ${continuedFrom}, not from ${killedAt}`
			],
			[check.problems.length === 0, check.problems.join('; ')]
		],
		secondsSince(t0)
	);
}
