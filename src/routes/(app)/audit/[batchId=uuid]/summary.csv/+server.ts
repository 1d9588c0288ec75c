import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getBatch, listItems } from '$lib/server/audit';
import { batchCsv } from '$lib/server/audit/export';

export async function GET(event) {
	const member = requireMember(event);
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	const csv = batchCsv(await listItems(member.organisationId, batch.id));
	const name = batch.name.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 60) || 'batch';
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="audit-${name}.csv"`
		}
	});
}
