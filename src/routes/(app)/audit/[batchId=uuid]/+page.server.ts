import { error, fail } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { batchSummary, getBatch, listItems } from '$lib/server/audit';
import { enqueueRecompute } from '$lib/server/audit/worker';
import { uChartSvg } from '$lib/server/audit/chart';

export async function load(event) {
	const member = requireMember(event);
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	const [items, summary] = await Promise.all([
		listItems(member.organisationId, batch.id),
		batchSummary(member.organisationId, batch.id)
	]);
	return {
		batch,
		items,
		summary,
		chart: summary.uByKind.length
			? uChartSvg(summary.uByKind, { width: 640, height: 240, font: 'Source Sans 3, sans-serif' })
			: null
	};
}

export const actions = {
	refresh: async (event) => {
		const member = requireRole(event, 'supervisor', 'admin');
		const batch = await getBatch(member.organisationId, event.params.batchId);
		if (!batch) error(404, 'No such batch.');
		const state = await enqueueRecompute(member.organisationId, batch.id, member.user.id);
		if (state === 'running') return fail(409, { message: 'A recompute of this batch is already running.' });
		return { queued: true };
	}
};
