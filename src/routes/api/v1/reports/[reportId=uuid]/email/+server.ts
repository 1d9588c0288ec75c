import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { emailReport, ReportError } from '$lib/server/reports';
import { apiFailure, emailSchema, ISSUE_ROLES, readJsonBody, zodIssues } from '$lib/server/reports/api';

/** E-mail the report (PDF attached) through the outbox: 202 with the queued message. */
export const POST = async (event) => {
	const member = requireRole(event, ...ISSUE_ROLES);
	const parsed = emailSchema.safeParse(await readJsonBody(event.request));
	if (!parsed.success) {
		return json({ message: 'The request is not valid.', issues: zodIssues(parsed.error) }, { status: 400 });
	}
	try {
		const mail = await emailReport(
			{ userId: member.user.id, organisationId: member.organisationId },
			event.params.reportId,
			parsed.data
		);
		return json(mail, { status: 202 });
	} catch (e) {
		if (e instanceof ReportError) return apiFailure(e);
		throw e;
	}
};
