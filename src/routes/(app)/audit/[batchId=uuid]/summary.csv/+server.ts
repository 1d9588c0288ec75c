import { requireMember } from '$lib/server/guard';
import { listItems } from '$lib/server/audit';
import { batchCsv } from '$lib/server/audit/export';
import { batchFileName, batchOr404 } from '../_batch';

export async function GET(event) {
	const member = requireMember(event);
	const batch = await batchOr404(member.organisationId, event.params.batchId);
	const csv = batchCsv(await listItems(member.organisationId, batch.id));
	const name = batchFileName(batch.name);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="audit-${name}.csv"`
		}
	});
}
