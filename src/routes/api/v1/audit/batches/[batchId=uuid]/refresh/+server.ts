import { error, json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { getBatch } from '$lib/server/audit';
import { enqueueRecompute } from '$lib/server/audit/worker';

/** Recompute the batch again with today's engine and library (queued). */
export async function POST(event) {
	const member = requireRole(event, 'supervisor', 'admin');
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	const state = await enqueueRecompute(member.organisationId, batch.id, member.user.id);
	return json({ state }, { status: 202 });
}
