import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { duplicateElement } from '$lib/server/dwellings/elements';
import { answer } from '$lib/server/http';

/** A copy of the element in the same dwelling. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await duplicateElement(member, event.params.elementId), { status: 201 });
	});
