import { error } from '@sveltejs/kit';
import { batchSummary, getBatch, listItems } from '$lib/server/audit';

/** The organisation's audit batch the address names; 404 when it has none of that id. */
export async function batchOr404(organisationId: string, batchId: string) {
	const batch = await getBatch(organisationId, batchId);
	if (!batch) error(404, 'No such batch.');
	return batch;
}

/** The batch with its items and its summary (the page and its PDF). */
export async function batchInFull(organisationId: string, batchId: string) {
	const batch = await batchOr404(organisationId, batchId);
	const [items, summary] = await Promise.all([
		listItems(organisationId, batch.id),
		batchSummary(organisationId, batch.id)
	]);
	return { batch, items, summary };
}

/** The batch's name as it may stand in a download's file name (letters, digits, . _ -; at most 60). */
export const batchFileName = (name: string) => name.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 60) || 'batch';
