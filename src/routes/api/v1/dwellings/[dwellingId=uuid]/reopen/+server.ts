import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { reopenDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { answer, readJson } from '$lib/server/http';

/** Reopen an accepted dwelling, or one awaiting review, for changes: body `{ reason, version }`. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await reopenDwelling(member, event.params.dwellingId, await readJson(event.request)));
	});
