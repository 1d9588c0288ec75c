import { requireMember } from '$lib/server/guard';
import { batchReportPdf } from '$lib/server/audit/pdf';
import { logActivity } from '$lib/server/activity';
import { batchFileName, batchInFull } from '../_batch';

export async function GET(event) {
	const member = requireMember(event);
	const { batch, items, summary } = await batchInFull(member.organisationId, event.params.batchId);
	const pdf = await batchReportPdf(
		batch,
		summary,
		items,
		member.user.name ?? member.user.email,
		member.organisationName
	);
	await logActivity({
		organisationId: member.organisationId,
		userId: member.user.id,
		action: 'audit-report-pdf',
		entity: 'audit_batch',
		entityId: batch.id,
		details: { items: items.length }
	});
	const name = batchFileName(batch.name);
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="audit-${name}.pdf"`
		}
	});
}
