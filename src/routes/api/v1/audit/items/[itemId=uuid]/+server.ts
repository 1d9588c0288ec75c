import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getItem } from '$lib/server/audit';

/** One audited dwelling: flags, recomputed figures beside the issued ones, and its history. */
export async function GET(event) {
	const member = requireMember(event);
	const item = await getItem(member.organisationId, event.params.itemId);
	if (!item) error(404, 'No such audit item.');
	return json(item);
}
