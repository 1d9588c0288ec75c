import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember, requireRole } from '$lib/server/guard';
import { issueReport, listReportsForDwelling, ReportError } from '$lib/server/reports';
import { db } from '$lib/server/db';
import {
	apiFailure,
	issueSchema,
	ISSUE_ROLES,
	publicOrigin,
	readJsonBody,
	zodIssues
} from '$lib/server/reports/api';

/** Issued reports of one dwelling: ?dwellingId= (newest first). */
export const GET = async (event) => {
	const member = requireMember(event);
	const parsed = z.object({ dwellingId: z.uuid({ error: 'must be the id of a dwelling' }) }).safeParse({
		dwellingId: event.url.searchParams.get('dwellingId') ?? undefined
	});
	if (!parsed.success) {
		return json({ message: 'Give ?dwellingId=', issues: zodIssues(parsed.error) }, { status: 400 });
	}
	const dwelling = await db('dwellings')
		.where({ id: parsed.data.dwellingId, organisation_id: member.organisationId })
		.first('id');
	if (!dwelling) return json({ message: 'No such dwelling.' }, { status: 404 });
	return json({ items: await listReportsForDwelling(member.organisationId, parsed.data.dwellingId) });
};

/** Issue a report of a dwelling, or of one element with `elementId`. */
export const POST = async (event) => {
	const member = requireRole(event, ...ISSUE_ROLES);
	const parsed = issueSchema.safeParse(await readJsonBody(event.request));
	if (!parsed.success) {
		return json({ message: 'The request is not valid.', issues: zodIssues(parsed.error) }, { status: 400 });
	}
	try {
		const report = await issueReport(
			{ userId: member.user.id, organisationId: member.organisationId },
			parsed.data,
			publicOrigin()
		);
		return json(report, { status: 201, headers: { location: `/api/v1/reports/${report.id}` } });
	} catch (e) {
		if (e instanceof ReportError) return apiFailure(e);
		throw e;
	}
};
