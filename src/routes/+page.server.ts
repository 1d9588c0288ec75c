import { redirect } from '@sveltejs/kit';

export const load = ({ locals }) => {
	if (!locals.user) redirect(303, '/signin');
	if (!locals.membership) redirect(303, '/not-a-member');
	redirect(303, '/dwellings');
};
