import { requireMember } from '$lib/server/guard';

export const load = (event) => {
	const member = requireMember(event);
	return {
		user: member.user,
		membership: {
			organisationId: member.organisationId,
			organisationName: member.organisationName,
			role: member.role
		}
	};
};
