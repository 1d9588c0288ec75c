import { error, json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getBatch } from '$lib/server/audit';

/** The batch with its progress (the page polls this every second while a recompute runs). */
export async function GET(event) {
	const member = requireMember(event);
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	return json(batch);
}
