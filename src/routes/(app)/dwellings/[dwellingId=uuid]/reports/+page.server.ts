import { error, fail } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember, requireRole } from '$lib/server/guard';
import { publicOrigin } from '$lib/server/config';
import { AppError } from '$lib/server/errors';
import { getDwelling } from '$lib/server/dwellings';
import { getElement } from '$lib/server/dwellings/elements';
import {
	buildSnapshot,
	emailReport,
	issueReport,
	listMailForDwelling,
	listReportsForDwelling
} from '$lib/server/reports';
import { requeueMail, kickOutbox } from '$lib/server/outbox';
import { readIssueChanges } from '$lib/server/reports/changes';
import { moistureWord, passWord } from '$lib/server/reports/document';
import { emailSchema } from '$lib/reports/schema';
import { ISSUE_ROLES } from '$lib/reports/rules';
import { clientSummary } from '$lib/reports/client-summary';
import { issueRefusal } from '$lib/dwellings/rules';
import { checkReportMailLimit } from '$lib/server/rate-limit';

async function dwellingOf(organisationId: string, dwellingId: string) {
	const d = await getDwelling(organisationId, dwellingId);
	if (!d) error(404, 'No such dwelling.');
	return d;
}

/** A refusal of the reports service as the page's answer (404 as the error page). */
function refused(e: unknown) {
	if (!(e instanceof AppError)) throw e;
	if (e.status === 404) error(404, e.message);
	return fail(e.status, { issueError: e.message, issues: e.issues.map((i) => i.message) });
}

export const load = async (event) => {
	const member = requireMember(event);
	const d = await dwellingOf(member.organisationId, event.params.dwellingId);
	// What the report would say now: every element recomputed, problems named (nothing rendered).
	const { snapshot, problems } = await buildSnapshot(
		member.organisationId,
		d.id,
		null,
		{
			scope: 'dwelling',
			draft: true,
			number: 'DRAFT',
			revision: 0,
			verificationCode: null,
			verifyUrl: null,
			supersedes: null,
			issuedBy: { id: member.user.id, name: member.user.name ?? member.user.email }
		},
		new Date().toISOString(),
		undefined,
		// the page lists problems only: a junction is solved again only when its elements or the engine changed
		{ junctions: 'check' }
	);
	const [reports, mail, changes] = await Promise.all([
		listReportsForDwelling(member.organisationId, d.id),
		listMailForDwelling(member.organisationId, d.id),
		d.issueChanges === null ? null : readIssueChanges(member.organisationId, d.id, d.issueChanges)
	]);
	return {
		dwelling: {
			id: d.id,
			reference: d.reference,
			address: d.address,
			status: d.status as string,
			stage: d.stage as string,
			clientName: d.clientName,
			clientEmail: d.clientEmail
		},
		elements: snapshot.elements.map((e) => ({
			id: e.id,
			name: e.name,
			kind: e.kind,
			area: e.area,
			u: e.u,
			limit: e.limit,
			pass: e.pass,
			result: passWord(e.pass),
			moisture: moistureWord(e),
			calculable: e.result !== null || e.u !== null
		})),
		limitTable: snapshot.limitTable ? `${snapshot.limitTable.name}, ${snapshot.limitTable.edition}` : null,
		// what the client reads first in the dwelling report and in the e-mail
		clientSummary: snapshot.elements.length ? clientSummary(snapshot) : null,
		assessor: snapshot.dwelling.assessor,
		problems,
		reports,
		changes,
		mail,
		// Only the dwelling's assessor issues (the declaration is theirs): others see why instead of a button.
		canIssue: issueRefusal({ userId: member.user.id, role: member.role }, d.assessorId) === null,
		issueRefusal: issueRefusal({ userId: member.user.id, role: member.role }, d.assessorId)
	};
};

const issueForm = z.object({
	elementId: z.union([z.uuid(), z.literal('')]).optional(),
	/** "yes" once the person has confirmed; without it the action only asks for the confirmation. */
	confirmed: z.literal('yes').optional()
});
const emailForm = emailSchema.extend({ reportId: z.uuid({ error: 'Choose a report.' }) });
const retryForm = z.object({ mailId: z.uuid() });

export const actions = {
	issue: async function issue(event) {
		const member = requireRole(event, ...ISSUE_ROLES);
		const parsed = issueForm.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success)
			return fail(400, { issueError: 'Choose the dwelling or one of its elements.', issues: [] as string[] });
		const elementId = parsed.data.elementId || null;
		if (!parsed.data.confirmed) {
			// Issuing cannot be undone: without JavaScript the page asks first, as a second step.
			const element = elementId ? await getElement(member.organisationId, elementId) : null;
			const label = elementId
				? element && element.dwellingId === event.params.dwellingId
					? { name: element.name }
					: null
				: { name: null };
			if (!label) error(404, 'No such element in this dwelling.');
			return { confirmIssue: { elementId: elementId ?? '', elementName: (label.name as string) ?? null } };
		}
		try {
			const r = await issueReport(
				{ userId: member.user.id, organisationId: member.organisationId },
				{ dwellingId: event.params.dwellingId, elementId },
				publicOrigin()
			);
			return { done: `Issued report ${r.number}, revision ${r.revision}.`, issuedId: r.id };
		} catch (e) {
			return refused(e);
		}
	},
	email: async function email(event) {
		const member = requireRole(event, ...ISSUE_ROLES);
		const raw = Object.fromEntries(await event.request.formData());
		const parsed = emailForm.safeParse({
			reportId: raw.reportId,
			to: raw.to,
			message: typeof raw.message === 'string' && raw.message.trim() ? raw.message : undefined
		});
		if (!parsed.success) {
			const fields: Record<string, string> = {};
			for (const i of parsed.error.issues) fields[String(i.path[0] ?? 'to')] ??= i.message;
			return fail(400, {
				emailReportId: String(raw.reportId ?? ''),
				emailErrors: fields,
				to: String(raw.to ?? '')
			});
		}
		try {
			await checkReportMailLimit(member.user.id);
			const m = await emailReport(
				{ userId: member.user.id, organisationId: member.organisationId },
				parsed.data.reportId,
				{ to: parsed.data.to, message: parsed.data.message },
				{ dwellingId: event.params.dwellingId }
			);
			return { done: `E-mail to ${m.to} queued; it is sent in a few seconds.` };
		} catch (e) {
			return refused(e);
		}
	},
	retry: async function retry(event) {
		const member = requireRole(event, ...ISSUE_ROLES);
		const parsed = retryForm.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { issueError: 'Choose a message.', issues: [] as string[] });
		if (
			!(await requeueMail(member.organisationId, parsed.data.mailId, { dwellingId: event.params.dwellingId }))
		)
			error(404, 'No such message.');
		kickOutbox();
		return { done: 'The message is queued again.' };
	}
};
