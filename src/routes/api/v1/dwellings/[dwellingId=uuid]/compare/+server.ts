import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { compareStages } from '$lib/server/dwellings/compare';
import { answer } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** An as-built dwelling beside its design: element pairs with build-ups, U and what changed. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const comparison = await compareStages(member.organisationId, event.params.dwellingId);
		if (!comparison) throw new NotFoundError('This dwelling was not copied from a design-stage dwelling.');
		return json(comparison);
	});
