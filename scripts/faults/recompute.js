// Audit recomputes and what they leave behind: a batch created through the API, its progress as the
// database holds it, and the check that every item of it was counted once (one recompute row in the
// append-only log per item, progress and items agreeing). Shared by the crash and the two-process rows.
import { db } from './data.js';
import { waitFor } from './env.js';
import { ok } from './http.js';

/** A batch of every dwelling of `programme`, created (and so queued) through `app`. */
export async function createBatch(app, org, programme) {
	return ok(app, 'POST', '/api/v1/audit/batches', {
		cookie: org.supervisor.cookie,
		json: {
			name: `Faults ${programme}`,
			filter: { programme },
			sampling: { rule: 'all', includeFlagged: false }
		}
	});
}

export async function progressOf(batchId) {
	const row = await db('audit_batches').where({ id: batchId }).first('progress');
	return row?.progress ?? {};
}

/** Wait until the batch's recompute has finished; its progress. */
export async function finished(batchId, ms) {
	return waitFor(
		`batch ${batchId} to finish`,
		async () => {
			const p = await progressOf(batchId);
			if (p.state === 'failed') throw new Error(`the recompute failed: ${p.error}`);
			return p.state === 'done' ? p : null;
		},
		ms,
		250
	);
}

/**
 * Whether every item of the batch was counted once: `total` items, each recomputed, each with exactly
 * one recompute row in the log, and the batch's counts agreeing with its items. The problems, if any.
 */
export async function countedOnce(batchId) {
	const p = await progressOf(batchId);
	const items = await db('audit_items').where({ batch_id: batchId }).select('id', 'recomputed_at', 'flags');
	const { rows: logged } = await db.raw(
		`SELECT entity_id, count(*)::int AS n FROM activity_log
		 WHERE action = 'audit-recompute' AND entity = 'audit_item' AND details->>'batchId' = ?
		 GROUP BY entity_id`,
		[batchId]
	);
	const problems = [];
	if (p.done !== items.length || p.total !== items.length)
		problems.push(`progress ${p.done}/${p.total} for ${items.length} items`);
	const notDone = items.filter((i) => !i.recomputed_at).length;
	if (notDone) problems.push(`${notDone} items never recomputed`);
	const twice = logged.filter((l) => l.n > 1).length;
	if (twice) problems.push(`${twice} items counted more than once`);
	if (logged.length !== items.length) problems.push(`${logged.length} items in the log for ${items.length}`);
	const flagged = items.filter((i) => (i.flags ?? []).length > 0).length;
	if ((p.flagged ?? 0) !== flagged) problems.push(`progress says ${p.flagged} flagged, the items ${flagged}`);
	return { items: items.length, logRows: logged.reduce((s, l) => s + l.n, 0), flagged, problems };
}
