import { error } from '@sveltejs/kit';
import type { DwellingPage } from '$lib/server/dwellings';

/** The list comes from the JSON API, in the page as on the server; the URL carries the filters. */
export const load = async ({ fetch, url, data }) => {
	const res = await fetch(`/api/v1/dwellings?${url.searchParams}`);
	if (res.status === 400) {
		const body = await res.json();
		return {
			...data,
			list: null,
			listError: body.issues
				?.map((i: { path: string; message: string }) => `${i.path} ${i.message}`)
				.join('; ') as string
		};
	}
	if (!res.ok) error(res.status, 'Could not load the dwellings.');
	return { ...data, list: (await res.json()) as DwellingPage, listError: null };
};
