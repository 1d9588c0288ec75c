import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getBatch, listItems } from '$lib/server/audit';

export async function GET(event) {
	const member = requireMember(event);
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	return json({ items: await listItems(member.organisationId, batch.id) });
}
