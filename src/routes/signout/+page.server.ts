import { redirect } from '@sveltejs/kit';
import { signOut } from '$lib/server/auth';

export const load = () => redirect(303, '/');

export const actions = {
	default: async (event) => {
		const headers = new Headers(event.request.headers);
		headers.set('content-type', 'application/x-www-form-urlencoded');
		const body = new URLSearchParams({ redirectTo: '/signin' });
		await signOut({ ...event, request: new Request(event.request.url, { method: 'POST', headers, body }) });
	}
};
