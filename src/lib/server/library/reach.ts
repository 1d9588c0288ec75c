/**
 * The reach of a library correction, as the pages and the API use it: which elements still use an older
 * revision of a material (`reach-query.ts`), moving a chosen set of them to the current revision
 * (`reach-move.ts`; more than MOVE_INLINE_MAX elements as a background job, `reach-worker.ts`), and the
 * dwellings' references for an audit batch. Every query filters by the caller's organisation.
 */
import { db } from '$lib/server/db';
import type { Member } from '$lib/server/guard';
import { ConflictError, ForbiddenError, NotFoundError } from '$lib/server/errors';
import { parseWith } from '$lib/server/http';
import { currentByCodes } from '$lib/server/library';
import { countReachWith, loadReachWith, type Reach, type ReachCount } from './reach-query';
import { MOVE_ROLES, runMove, type MoveItem } from './reach-move';
import { enqueueMove, startReachWorker } from './reach-worker';
import { MOVE_MAX, moveRequestSchema } from './reach-schema';

export { MOVE_MAX, moveRequestSchema, reachQuerySchema } from './reach-schema';

export type { Reach, ReachCount, ReachDwelling, ReachElement, ReachTotals } from './reach-query';
export type { MoveItem, MoveOutcome } from './reach-move';

/** Moves of up to this many elements are done while the request waits; more run as a background job. */
export const MOVE_INLINE_MAX = 50;

/** The reach of the material's current revision; null when the material is not the organisation's. */
export function getReach(organisationId: string, materialId: string): Promise<Reach | null> {
	return loadReachWith(db, organisationId, materialId);
}

/** One page of the reach's dwellings (the totals stay those of every dwelling). */
export function reachPage(reach: Reach, page: number, pageSize: number) {
	const pages = Math.max(1, Math.ceil(reach.dwellings.length / pageSize));
	const p = Math.min(Math.max(1, page), pages);
	return {
		...reach,
		page: p,
		pageSize,
		pages,
		dwellings: reach.dwellings.slice((p - 1) * pageSize, p * pageSize)
	};
}

/** Every element of the reach, by id (what "move all" moves). */
export const reachElementIds = (reach: Reach) => reach.dwellings.flatMap((d) => d.elements.map((e) => e.id));

/** The dwellings' references, in reference order (for an audit batch). */
export const reachReferences = (reach: Reach) => reach.dwellings.map((d) => d.reference);

/**
 * For the materials of these codes (a CSV import's revised rows): how many elements and dwellings use an
 * older revision of each. Codes not in the library are left out.
 */
export async function reachOfCodes(organisationId: string, codes: string[]): Promise<ReachCount[]> {
	const current = await currentByCodes(db, organisationId, [...new Set(codes)].slice(0, 20_000));
	const ids = [...current.values()].map((c) => c.materialId);
	const counts = await countReachWith(db, organisationId, ids);
	return counts.sort((a, b) => a.code.localeCompare(b.code));
}

export type Move = {
	id: string;
	materialId: string;
	toRevisionId: string;
	toRevision: number | null;
	state: 'queued' | 'running' | 'done' | 'failed';
	total: number;
	done: number;
	moved: number;
	already: number;
	skipped: number;
	failed: number;
	error: string | null;
	createdAt: string;
	finishedAt: string | null;
	/** whether the move runs as a background job */
	background: boolean;
};

/** What became of each element, with its name and dwelling when they still exist. */
export type MoveItemShown = MoveItem & {
	elementName: string | null;
	dwellingId: string | null;
	dwellingReference: string | null;
};

function toMove(r: Record<string, any>): Move {
	return {
		id: r.id,
		materialId: r.material_id,
		toRevisionId: r.to_revision_id,
		toRevision: r.to_revision ?? null,
		state: r.state,
		total: r.total,
		done: r.done,
		moved: r.moved,
		already: r.already,
		skipped: r.skipped,
		failed: r.failed,
		error: r.error ?? null,
		createdAt: new Date(r.created_at).toISOString(),
		finishedAt: r.finished_at ? new Date(r.finished_at).toISOString() : null,
		background: r.total > MOVE_INLINE_MAX
	};
}

/** The current revision of the material; 404 when it is not the organisation's, 409 when `revisionId` is not it. */
async function assertCurrent(organisationId: string, materialId: string, revisionId: string) {
	const m = await db('materials as m')
		.join('material_revisions as r', 'r.id', 'm.current_revision_id')
		.where({ 'm.organisation_id': organisationId, 'm.id': materialId })
		.first('r.id', 'r.revision');
	if (!m) throw new NotFoundError('No such material in your library.');
	if (m.id !== revisionId) {
		const asked = await db('material_revisions')
			.where({ organisation_id: organisationId, material_id: materialId, id: revisionId })
			.first('revision');
		throw new ConflictError(
			asked
				? `Revision ${asked.revision} is not the material’s current revision; revision ${m.revision} is. Elements move to the current revision only.`
				: `That is not a revision of this material; its current revision is ${m.revision}.`,
			{ issues: [{ path: 'toRevisionId', message: `must be the current revision (${m.revision})` }] }
		);
	}
	return m as { id: string; revision: number };
}

/**
 * Move the named elements to the material's current revision: done at once for up to MOVE_INLINE_MAX
 * elements (the answer lists each element's outcome), queued as a background job beyond that (the answer
 * is the move with its progress). Assessors and admins, as for any change of an element.
 */
export async function startMove(
	member: Member,
	materialId: string,
	raw: unknown
): Promise<{ move: Move; items: MoveItemShown[] }> {
	if (!MOVE_ROLES.includes(member.role)) {
		throw new ForbiddenError(`Moving elements needs the assessor or admin role; you are ${member.role}.`);
	}
	const body = parseWith(moveRequestSchema, raw, 'move');
	await assertCurrent(member.organisationId, materialId, body.toRevisionId);
	const elementIds = [...new Set(body.elementIds)];
	const [row] = await db('material_moves')
		.insert({
			organisation_id: member.organisationId,
			material_id: materialId,
			to_revision_id: body.toRevisionId,
			requested_by: member.user.id,
			element_ids: elementIds,
			total: elementIds.length
		})
		.returning('id');
	if (elementIds.length > MOVE_INLINE_MAX) await enqueueMove(member.organisationId, row.id);
	else await runMove(row.id);
	return (await getMove(member.organisationId, materialId, row.id))!;
}

/** A move of the material with the outcome of each element done so far (at most `limit` of them). */
export async function getMove(
	organisationId: string,
	materialId: string,
	moveId: string,
	limit = 500
): Promise<{ move: Move; items: MoveItemShown[] } | null> {
	const row = await db('material_moves as mv')
		.leftJoin('material_revisions as r', 'r.id', 'mv.to_revision_id')
		.where({ 'mv.organisation_id': organisationId, 'mv.material_id': materialId, 'mv.id': moveId })
		.first('mv.*', 'r.revision as to_revision');
	if (!row) return null;
	const items = await db('material_move_items as i')
		.leftJoin('elements as e', function () {
			this.on('e.id', 'i.element_id').andOnVal('e.organisation_id', organisationId);
		})
		.leftJoin('dwellings as d', 'd.id', 'e.dwelling_id')
		.where('i.move_id', moveId)
		// what needs a look first: refused elements, then the rest
		.orderByRaw(
			`CASE i.outcome WHEN 'failed' THEN 0 WHEN 'skipped' THEN 1 ELSE 2 END, d.reference, e.position`
		)
		.limit(limit)
		.select('i.*', 'e.name as element_name', 'd.id as dwelling_id', 'd.reference');
	return {
		move: toMove(row),
		items: items.map((i) => ({
			elementId: i.element_id,
			outcome: i.outcome,
			reason: i.reason ?? null,
			fromRevision: i.from_revision ?? null,
			toRevision: i.to_revision ?? null,
			version: i.version ?? null,
			elementName: i.element_name ?? null,
			dwellingId: i.dwelling_id ?? null,
			dwellingReference: i.reference ?? null
		}))
	};
}

/** The material's latest moves, newest first. */
export async function listMoves(organisationId: string, materialId: string, limit = 5): Promise<Move[]> {
	const rows = await db('material_moves as mv')
		.leftJoin('material_revisions as r', 'r.id', 'mv.to_revision_id')
		.where({ 'mv.organisation_id': organisationId, 'mv.material_id': materialId })
		.orderBy('mv.created_at', 'desc')
		.limit(limit)
		.select('mv.id', 'mv.material_id', 'mv.to_revision_id', 'mv.state', 'mv.total', 'mv.done', 'mv.moved')
		.select('mv.already', 'mv.skipped', 'mv.failed', 'mv.error', 'mv.created_at', 'mv.finished_at')
		.select('r.revision as to_revision');
	const moves = rows.map(toMove);
	// A move still waiting: make sure this process works the queue (it may have loaded the worker only on
	// this request); the worker's recovery queues a stalled move again within RECOVER_EVERY_MS.
	if (moves.some((m) => m.state === 'queued' || m.state === 'running')) {
		void startReachWorker().catch((e) => console.error('[envelo] library reach worker:', e));
	}
	return moves;
}
