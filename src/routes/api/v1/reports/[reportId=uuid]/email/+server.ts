import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { emailReport } from '$lib/server/reports';
import { answer, parseWith, readJson } from '$lib/server/http';
import { emailSchema } from '$lib/reports/schema';
import { ISSUE_ROLES } from '$lib/reports/rules';
import { checkReportMailLimit } from '$lib/server/rate-limit';

/** E-mail the report (PDF attached) through the outbox: 202 with the queued message. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...ISSUE_ROLES);
		const input = parseWith(emailSchema, await readJson(event.request));
		await checkReportMailLimit(member.user.id);
		const mail = await emailReport(
			{ userId: member.user.id, organisationId: member.organisationId },
			event.params.reportId,
			input
		);
		return json(mail, { status: 202 });
	});
