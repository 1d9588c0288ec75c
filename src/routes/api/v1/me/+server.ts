import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';

/** Who the caller is: user, organisation, role. */
export const GET = (event) => {
	const m = requireMember(event);
	return json({
		user: m.user,
		organisation: { id: m.organisationId, name: m.organisationName },
		role: m.role
	});
};
