import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember, requireRole } from '$lib/server/guard';
import { issueReport, listReportsForDwelling } from '$lib/server/reports';
import { answer, parseWith, readJson } from '$lib/server/http';
import { publicOrigin } from '$lib/server/config';
import { issueSchema } from '$lib/reports/schema';
import { ISSUE_ROLES } from '$lib/reports/rules';

const listQuery = z.object({ dwellingId: z.uuid({ error: 'must be the id of a dwelling' }) });

/** Issued reports of one dwelling: ?dwellingId= (newest first). */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const { dwellingId } = parseWith(
			listQuery,
			{ dwellingId: event.url.searchParams.get('dwellingId') ?? undefined },
			'query'
		);
		return json({ items: await listReportsForDwelling(member.organisationId, dwellingId) });
	});

/** Issue a report of a dwelling, or of one element with `elementId`. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...ISSUE_ROLES);
		const input = parseWith(issueSchema, await readJson(event.request));
		const report = await issueReport(
			{ userId: member.user.id, organisationId: member.organisationId },
			input,
			publicOrigin()
		);
		return json(report, { status: 201, headers: { location: `/api/v1/reports/${report.id}` } });
	});
