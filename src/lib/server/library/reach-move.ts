/**
 * Moving elements to a material's current revision, one element at a time, each saved through the element
 * service (`updateElement`): so every move is versioned, recomputed, logged and counted as a change since
 * issue, and a dwelling that must be reopened first refuses it (409, code 'reopen-required'), which skips
 * that element and says why, never the whole move. The layer takes the revision's values as the editor's
 * "Use revision N" offer does: the updates `findNewerRevisions` offers, applied by `applyRevisionUpdate`.
 *
 * A move is a row of `material_moves` (the elements, the target revision, who asked) and one outcome per
 * element in `material_move_items`; a run writes them as it goes, so a second run of the same move
 * continues where the first stopped, and moving an element already on the revision moves nothing.
 */
import { db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import { AppError, ConflictError, NotFoundError, ValidationError } from '$lib/server/errors';
import { getElement, updateElement, type Element } from '$lib/server/dwellings/elements';
import { applyRevisionUpdate, findNewerRevisions } from '$lib/server/library';
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import type { Role } from '$lib/members/roles';
import type { MaterialMoveRow } from '$lib/server/tables';

export type MoveOutcome = 'moved' | 'already' | 'skipped' | 'failed';

export type MoveItem = {
	elementId: string;
	outcome: MoveOutcome;
	/** why an element was not moved, in words */
	reason: string | null;
	fromRevision: number | null;
	toRevision: number | null;
	/** the element's version after the move */
	version: number | null;
};

/** What a move moves to: the material, its revision, and the move it belongs to (for the log). */
export type MoveTarget = { materialId: string; toRevisionId: string; moveId: string | null };

/** Roles that change elements (the element service's WRITE_ROLES). */
export const MOVE_ROLES: readonly Role[] = ['assessor', 'admin'];

const item = (elementId: string, outcome: MoveOutcome, reason: string | null = null): MoveItem => ({
	elementId,
	outcome,
	reason,
	fromRevision: null,
	toRevision: null,
	version: null
});

/** The element's fields as the element service takes them, with another build-up. */
function bodyOf(el: Element, buildUp: StoredBuildUp) {
	return {
		name: el.name,
		kind: el.kind,
		area: el.area,
		heatFlow: el.heatFlow,
		position: el.position,
		buildUp,
		givenU: el.givenU,
		givenUSource: el.givenUSource,
		climateId: el.climateId,
		internal: el.internal,
		version: el.version
	};
}

/** An element with no layer to move: already on the revision, or not using the material at all. */
function nothingToMove(el: Element, target: MoveTarget): MoveItem {
	const layers = (el.buildUp?.layers ?? []).filter((l) => l.materialId === target.materialId);
	if (layers.length === 0) return item(el.id, 'skipped', 'It has no layer of this material.');
	if (layers.every((l) => l.materialRevisionId === target.toRevisionId)) {
		return item(el.id, 'already', 'It is on this revision already.');
	}
	return item(el.id, 'skipped', 'Its layers of this material are on no older revision of it.');
}

/** A refusal of the element service as the element's outcome; anything unexpected is thrown on. */
function refused(elementId: string, e: unknown): MoveItem {
	if (e instanceof ConflictError && e.extra.code === 'reopen-required') {
		return item(elementId, 'skipped', `Reopen the dwelling first. ${e.message}`);
	}
	if (e instanceof ValidationError) {
		const issues = e.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
		return item(elementId, 'failed', `The element with the new values is refused: ${issues || e.message}`);
	}
	if (e instanceof ConflictError || e instanceof NotFoundError) return item(elementId, 'skipped', e.message);
	if (e instanceof AppError) return item(elementId, 'failed', e.message);
	throw e;
}

/**
 * Move one element's layers of the material to the target revision and save it, logged as
 * 'move-revision' with the revisions before and after. A save that meets someone else's newer version
 * reads the element again once.
 */
export async function moveElement(member: Member, target: MoveTarget, elementId: string): Promise<MoveItem> {
	for (let attempt = 0; attempt < 2; attempt++) {
		const el = await getElement(member.organisationId, elementId);
		if (!el) return item(elementId, 'skipped', 'The element no longer exists.');
		const updates = (await findNewerRevisions(member.organisationId, el.buildUp)).filter(
			(u) => u.materialId === target.materialId
		);
		if (updates.length === 0) return nothingToMove(el, target);
		const other = updates.find((u) => u.toRevisionId !== target.toRevisionId);
		if (other) {
			return item(
				el.id,
				'skipped',
				`Revision ${other.toRevision} is now the material’s current revision: look at the reach again and move to it.`
			);
		}
		try {
			const saved = await updateElement(member, el.id, bodyOf(el, applyRevisionUpdate(el.buildUp!, updates)));
			await logMove(member, target, el, updates, saved);
			return {
				elementId: el.id,
				outcome: 'moved',
				reason: null,
				fromRevision: Math.min(...updates.map((u) => u.fromRevision)),
				toRevision: updates[0].toRevision,
				version: saved.version
			};
		} catch (e) {
			if (e instanceof ConflictError && e.current !== undefined && attempt === 0) continue;
			return refused(el.id, e);
		}
	}
	return item(
		elementId,
		'skipped',
		'Someone else saved the element while it was being moved; move it again.'
	);
}

type Updates = Awaited<ReturnType<typeof findNewerRevisions>>;

/** The activity log's entry for one moved element: which layers, from which revisions, to which. */
async function logMove(member: Member, target: MoveTarget, el: Element, updates: Updates, saved: Element) {
	await logActivity({
		organisationId: member.organisationId,
		userId: member.user.id,
		action: 'move-revision',
		entity: 'element',
		entityId: el.id,
		details: {
			dwellingId: el.dwellingId,
			materialId: target.materialId,
			code: updates[0].to.code,
			moveId: target.moveId,
			layers: updates.map((u) => ({
				layerIndex: u.layerIndex,
				fromRevisionId: u.fromRevisionId,
				fromRevision: u.fromRevision,
				toRevisionId: u.toRevisionId,
				toRevision: u.toRevision
			})),
			fromRevisions: [...new Set(updates.map((u) => u.fromRevision))],
			toRevisionId: target.toRevisionId,
			toRevision: updates[0].toRevision,
			versionBefore: el.version,
			versionAfter: saved.version,
			uBefore: el.lastResult?.uValue ?? null,
			uAfter: saved.lastResult?.uValue ?? null
		}
	});
}

/* ------------------------------------------------------------ runs of a move */

/** How long a running move may go without a heartbeat before another run takes it over. */
export const STALL_AFTER_SECONDS = 60;

/** Take the move for this run: queued, or running with no heartbeat for a minute; null when held or over. */
async function claim(moveId: string): Promise<MaterialMoveRow | null> {
	const [row] = await db<MaterialMoveRow>('material_moves')
		.where({ id: moveId })
		.andWhere((q) =>
			q
				.where('state', 'queued')
				.orWhere((r) =>
					r
						.where('state', 'running')
						.andWhere((h) =>
							h
								.whereNull('heartbeat_at')
								.orWhere(
									'heartbeat_at',
									'<',
									db.raw(`now() - make_interval(secs => ?)`, [STALL_AFTER_SECONDS])
								)
						)
				)
		)
		.update({
			state: 'running',
			started_at: db.raw('coalesce(started_at, now())'),
			heartbeat_at: db.fn.now()
		})
		.returning('*');
	return row ?? null;
}

/** The member who asked for the move, as they are now: null when they no longer change elements. */
async function requester(row: MaterialMoveRow): Promise<Member | null> {
	if (!row.requested_by) return null;
	const m = await db('memberships as m')
		.join('users as u', 'u.id', 'm.user_id')
		.join('organisations as o', 'o.id', 'm.organisation_id')
		.where({ 'm.organisation_id': row.organisation_id, 'm.user_id': row.requested_by })
		.first('u.id', 'u.email', 'u.name', 'm.role', 'o.name as organisation_name');
	if (!m || !MOVE_ROLES.includes(m.role)) return null;
	return {
		user: { id: m.id, email: m.email, name: m.name ?? null },
		organisationId: row.organisation_id,
		organisationName: m.organisation_name,
		role: m.role
	};
}

/** The counts of the move from its items, and a heartbeat. */
async function recount(moveId: string) {
	await db.raw(
		`UPDATE material_moves m SET done = c.done, moved = c.moved, already = c.already, skipped = c.skipped,
		        failed = c.failed, heartbeat_at = now()
		   FROM (SELECT count(*)::int AS done,
		                count(*) FILTER (WHERE outcome = 'moved')::int AS moved,
		                count(*) FILTER (WHERE outcome = 'already')::int AS already,
		                count(*) FILTER (WHERE outcome = 'skipped')::int AS skipped,
		                count(*) FILTER (WHERE outcome = 'failed')::int AS failed
		           FROM material_move_items WHERE move_id = ?) c
		  WHERE m.id = ?`,
		[moveId, moveId]
	);
}

async function saveItems(moveId: string, items: MoveItem[]) {
	if (items.length === 0) return;
	await db('material_move_items')
		.insert(
			items.map((i) => ({
				move_id: moveId,
				element_id: i.elementId,
				outcome: i.outcome,
				reason: i.reason,
				from_revision: i.fromRevision,
				to_revision: i.toRevision,
				version: i.version
			}))
		)
		.onConflict(['move_id', 'element_id'])
		.ignore();
	await recount(moveId);
}

async function finish(row: MaterialMoveRow, member: Member | null, error: string | null) {
	const [done] = await db('material_moves')
		.where({ id: row.id })
		.update({ state: error ? 'failed' : 'done', error, finished_at: db.fn.now(), heartbeat_at: null })
		.returning('*');
	await logActivity({
		organisationId: row.organisation_id,
		userId: member?.user.id ?? row.requested_by ?? null,
		action: 'move-revision',
		entity: 'material',
		entityId: row.material_id,
		details: {
			moveId: row.id,
			toRevisionId: row.to_revision_id,
			total: done.total,
			moved: done.moved,
			already: done.already,
			skipped: done.skipped,
			failed: done.failed,
			error
		}
	});
}

/**
 * Run a move: each element not yet done, in the order asked, its outcome written every `chunkSize`
 * elements with a heartbeat. Returns false when the move is held by another live run, is over already,
 * or `signal` stopped this run (it leaves the move without a heartbeat, for the next run to continue).
 */
export async function runMove(
	moveId: string,
	opts: { signal?: AbortSignal; chunkSize?: number } = {}
): Promise<boolean> {
	const row = await claim(moveId);
	if (!row) return false;
	try {
		const member = await requester(row);
		if (!member) {
			await finish(
				row,
				null,
				'The person who asked for the move no longer changes elements in this organisation.'
			);
			return true;
		}
		const seen = new Set<string>(
			(await db('material_move_items').where({ move_id: moveId }).pluck('element_id')) as string[]
		);
		const target = { materialId: row.material_id, toRevisionId: row.to_revision_id, moveId };
		const todo = (row.element_ids as string[]).filter((id) => !seen.has(id));
		const size = opts.chunkSize ?? 10;
		for (let i = 0; i < todo.length; i += size) {
			if (opts.signal?.aborted) {
				await db('material_moves').where({ id: moveId }).update({ heartbeat_at: null });
				return false;
			}
			const items: MoveItem[] = [];
			for (const id of todo.slice(i, i + size)) items.push(await moveElement(member, target, id));
			await saveItems(moveId, items);
		}
		await finish(row, member, null);
		return true;
	} catch (e) {
		// let the next run take the move over at once (its items so far are kept)
		await db('material_moves')
			.where({ id: moveId })
			.update({ heartbeat_at: null })
			.catch(() => {});
		throw e;
	}
}

/** Moves that are queued or whose run has stalled, for a worker to queue again. */
export async function stalledMoves(): Promise<{ id: string; organisationId: string }[]> {
	const rows = await db('material_moves')
		.whereIn('state', ['queued', 'running'])
		.andWhere((q) =>
			q
				.whereNull('heartbeat_at')
				.orWhere('heartbeat_at', '<', db.raw(`now() - make_interval(secs => ?)`, [STALL_AFTER_SECONDS]))
		)
		.andWhere('created_at', '<', db.raw(`now() - interval '30 seconds'`))
		.select('id', 'organisation_id');
	return rows.map((r) => ({ id: r.id, organisationId: r.organisation_id }));
}
