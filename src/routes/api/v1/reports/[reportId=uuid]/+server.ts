import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getReport, listMailForReport } from '$lib/server/reports';

/** One issued report: its identity, hash and code, and the e-mails sent with it. `?snapshot=1` adds the frozen input and results. */
export const GET = async (event) => {
	const member = requireMember(event);
	const report = await getReport(member.organisationId, event.params.reportId);
	if (!report) return json({ message: 'No such report.' }, { status: 404 });
	const { snapshot, ...summary } = report;
	return json({
		...summary,
		pdfUrl: `/api/v1/reports/${report.id}.pdf`,
		mail: await listMailForReport(member.organisationId, report.id),
		...(event.url.searchParams.get('snapshot') === '1' ? { snapshot } : {})
	});
};
