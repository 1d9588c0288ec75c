import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { answer, readJson } from '$lib/server/http';
import { startMove } from '$lib/server/library/reach';
import { MOVE_ROLES } from '$lib/server/library/reach-move';

/**
 * Move elements to the material's current revision. Body `{ elementIds, toRevisionId }`. Up to 50
 * elements: done now (200, each element's outcome). More: a background job (202, the move and its
 * progress; GET …/reach/move/{moveId} follows it). Elements of a dwelling to be reopened first are
 * skipped with the reason, never the whole move.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...MOVE_ROLES);
		const out = await startMove(member, event.params.materialId, await readJson(event.request));
		return json(out, { status: out.move.state === 'done' || out.move.state === 'failed' ? 200 : 202 });
	});
