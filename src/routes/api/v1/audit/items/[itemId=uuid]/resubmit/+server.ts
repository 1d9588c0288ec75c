import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { resubmitItem } from '$lib/server/audit';
import { resubmitSchema } from '$lib/audit/schemas';
import { failure, readJson, validate } from '$lib/server/audit/http';

/** The assessor answers a return after issuing the report again. */
export async function POST(event) {
	const member = requireMember(event);
	try {
		const input = validate(resubmitSchema, await readJson(event.request));
		return json(await resubmitItem(member, event.params.itemId, input));
	} catch (e) {
		return failure(e);
	}
}
