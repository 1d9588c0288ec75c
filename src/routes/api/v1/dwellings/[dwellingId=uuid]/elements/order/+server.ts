import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { reorderElements } from '$lib/server/dwellings/elements';
import { answer, readJson } from '$lib/server/http';

/**
 * Put the dwelling's elements in a new order: `{ ids: [...every element id once...], version }` with the
 * dwelling's version (409 when stale). Answers the dwelling's new version and the ids in order.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await reorderElements(member, event.params.dwellingId, await readJson(event.request)));
	});
