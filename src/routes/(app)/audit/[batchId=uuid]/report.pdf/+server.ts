import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { batchSummary, getBatch, listItems } from '$lib/server/audit';
import { batchReportPdf } from '$lib/server/audit/pdf';
import { logActivity } from '$lib/server/activity';

export async function GET(event) {
	const member = requireMember(event);
	const batch = await getBatch(member.organisationId, event.params.batchId);
	if (!batch) error(404, 'No such batch.');
	const [summary, items] = await Promise.all([
		batchSummary(member.organisationId, batch.id),
		listItems(member.organisationId, batch.id)
	]);
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
	const name = batch.name.replace(/[^A-Za-z0-9._-]+/g, '-').slice(0, 60) || 'batch';
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-disposition': `inline; filename="audit-${name}.pdf"`
		}
	});
}
