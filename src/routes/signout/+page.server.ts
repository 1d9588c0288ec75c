import { redirect } from '@sveltejs/kit';
import { onPublicOrigin, signOut } from '$lib/server/auth';

export const load = () => redirect(303, '/');

export const actions = {
	default: async (event) => {
		const body = new URLSearchParams({ redirectTo: '/signin' });
		await signOut(onPublicOrigin(event, '/signout', body));
	}
};
