import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { decideItem } from '$lib/server/audit';
import { decisionSchema } from '$lib/audit/schemas';
import { failure, readJson, validate } from '$lib/server/audit/http';

/** Accepted, Accepted with advice or Returned for correction, with a comment. Supervisors and admins only. */
export async function POST(event) {
	const member = requireRole(event, 'supervisor', 'admin');
	try {
		const input = validate(decisionSchema, await readJson(event.request));
		return json(await decideItem(member, event.params.itemId, input));
	} catch (e) {
		return failure(e);
	}
}
