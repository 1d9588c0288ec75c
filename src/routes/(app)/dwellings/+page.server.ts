import { requireMember } from '$lib/server/guard';
import { listAssessors } from '$lib/server/dwellings';

export const load = async (event) => {
	const member = requireMember(event);
	return { assessors: await listAssessors(member.organisationId) };
};
