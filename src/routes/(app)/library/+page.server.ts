import { requireMember } from '$lib/server/guard';

export const load = (event) => {
	const member = requireMember(event);
	return {
		canEdit: member.role === 'assessor' || member.role === 'admin',
		canVerify: member.role === 'supervisor' || member.role === 'admin'
	};
};
