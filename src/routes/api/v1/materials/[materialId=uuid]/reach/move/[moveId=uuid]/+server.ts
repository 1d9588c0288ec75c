import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { answer } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';
import { getMove } from '$lib/server/library/reach';

/** A move with its progress and the outcome of each element done so far (refused ones first). */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const move = await getMove(member.organisationId, event.params.materialId, event.params.moveId);
		if (!move) throw new NotFoundError('No such move of this material.');
		return json(move);
	});
