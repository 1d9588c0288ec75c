import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getReportPdf } from '$lib/server/reports';
import { pdfResponse } from '$lib/server/http';

/** The issued PDF, exactly as stored (its SHA-256 is in the x-content-sha256 header). `?download=1` saves it. */
export const GET = async (event) => {
	const member = requireMember(event);
	const stored = await getReportPdf(member.organisationId, event.params.reportId);
	if (!stored) return json({ message: 'No such report.' }, { status: 404 });
	const res = pdfResponse(
		stored.pdf,
		stored.filename,
		event.url.searchParams.get('download') === '1' ? 'attachment' : 'inline'
	);
	res.headers.set('x-content-sha256', stored.sha256);
	return res;
};
