import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { resubmitItem } from '$lib/server/audit';
import { resubmitSchema } from '$lib/audit/schemas';
import { errorResponse, readJson, parseWith } from '$lib/server/http';

/** The assessor answers a return after issuing the report again. */
export async function POST(event) {
	const member = requireMember(event);
	try {
		const input = parseWith(resubmitSchema, await readJson(event.request));
		return json(await resubmitItem(member, event.params.itemId, input));
	} catch (e) {
		return errorResponse(e);
	}
}
