import { fail } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { enqueueRecompute } from '$lib/server/audit/worker';
import { uChartSvg } from '$lib/server/audit/chart';
import { readForm } from '$lib/server/forms';
import { batchRefreshFormSchema } from '$lib/audit/forms';
import { batchInFull, batchOr404 } from './_batch';

export async function load(event) {
	const member = requireMember(event);
	const { batch, items, summary } = await batchInFull(member.organisationId, event.params.batchId);
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
		// a button and nothing else: the batch is the page's
		await readForm(event.request, batchRefreshFormSchema);
		const batch = await batchOr404(member.organisationId, event.params.batchId);
		const state = await enqueueRecompute(member.organisationId, batch.id, member.user.id);
		if (state === 'running') return fail(409, { error: 'A recompute of this batch is already running.' });
		// the progress bar shows it from here
		return { done: 'The recompute is queued.' };
	}
};
