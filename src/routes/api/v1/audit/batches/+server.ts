import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createBatch, listBatches } from '$lib/server/audit';
import { enqueueRecompute } from '$lib/server/audit/worker';
import { newBatchSchema } from '$lib/audit/schemas';
import { errorResponse, readJson, parseWith } from '$lib/server/http';

export async function GET(event) {
	const member = requireMember(event);
	return json({ items: await listBatches(member.organisationId) });
}

/** Create a batch from a filter or a list of references; the recompute is queued at once. */
export async function POST(event) {
	const member = requireRole(event, 'supervisor', 'admin');
	try {
		const input = parseWith(newBatchSchema, await readJson(event.request));
		const created = await createBatch(member, input);
		await enqueueRecompute(member.organisationId, created.id, member.user.id);
		return json(created, { status: 201 });
	} catch (e) {
		return errorResponse(e);
	}
}
