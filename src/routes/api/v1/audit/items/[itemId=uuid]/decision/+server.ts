import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { decideItem } from '$lib/server/audit';
import { decisionSchema } from '$lib/audit/schemas';
import { errorResponse, readJson, parseWith } from '$lib/server/http';

/** Accepted, Accepted with advice or Returned for correction, with a comment. Supervisors and admins only. */
export async function POST(event) {
	const member = requireRole(event, 'supervisor', 'admin');
	try {
		const input = parseWith(decisionSchema, await readJson(event.request));
		return json(await decideItem(member, event.params.itemId, input));
	} catch (e) {
		return errorResponse(e);
	}
}
