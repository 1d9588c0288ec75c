import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { copyDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { answer, readJson } from '$lib/server/http';

/** A new draft with the same details and copies of every element: body `{ reference, address? }`. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await copyDwelling(member, event.params.dwellingId, await readJson(event.request)), {
			status: 201
		});
	});
