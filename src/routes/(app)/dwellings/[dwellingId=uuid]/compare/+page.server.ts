import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { compareStages } from '$lib/server/dwellings/compare';

export const load = async (event) => {
	const member = requireMember(event);
	const comparison = await compareStages(member.organisationId, event.params.dwellingId);
	if (!comparison)
		error(404, 'This dwelling was not copied from a design-stage dwelling, so there is nothing to compare.');
	return { comparison };
};
