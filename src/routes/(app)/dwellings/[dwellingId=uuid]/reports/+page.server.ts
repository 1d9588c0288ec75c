import { error, fail } from '@sveltejs/kit';
import { setError } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import { publicOrigin } from '$lib/server/config';
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
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
import { emailFormSchema, issueFormSchema, retryFormSchema } from '$lib/reports/forms';
import { ISSUE_ROLES } from '$lib/reports/rules';
import { clientSummary } from '$lib/reports/client-summary';
import { issueRefusal } from '$lib/dwellings/rules';
import { checkReportMailLimit } from '$lib/server/rate-limit';

async function dwellingOf(organisationId: string, dwellingId: string) {
	const d = await getDwelling(organisationId, dwellingId);
	if (!d) error(404, 'No such dwelling.');
	return d;
}

/** A refusal to issue, as the page's answer: why, and each problem on its own line (404 as the error page). */
const refused = (e: unknown) => refuseAction(e, (r) => r.message);

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
		// one e-mail form a report, each under its own id (`report-email-form.svelte`)
		emailForm: await formFor(emailFormSchema, { reportId: '', to: d.clientEmail ?? '', message: '' }),
		canIssue: issueRefusal({ userId: member.user.id, role: member.role }, d.assessorId) === null,
		issueRefusal: issueRefusal({ userId: member.user.id, role: member.role }, d.assessorId)
	};
};

export const actions = {
	issue: async function issue(event) {
		const member = requireRole(event, ...ISSUE_ROLES);
		const form = await readForm(event.request, issueFormSchema);
		if (!form.valid) return fail(400, { error: 'Choose the dwelling or one of its elements.', issues: [] });
		const elementId = form.data.elementId || null;
		if (!form.data.confirmed) {
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
		const form = await readForm(event.request, emailFormSchema);
		if (!form.valid) return fail(400, { form });
		const { reportId, to, message } = form.data;
		const parsed = emailSchema.safeParse({ to, message: message.trim() ? message : undefined });
		if (!parsed.success) {
			for (const i of parsed.error.issues)
				setError(form, i.path[0] === 'message' ? 'message' : 'to', i.message);
			return fail(400, { form });
		}
		try {
			await checkReportMailLimit(member.user.id);
			const m = await emailReport(
				{ userId: member.user.id, organisationId: member.organisationId },
				reportId,
				parsed.data,
				{ dwellingId: event.params.dwellingId }
			);
			return { form, done: `E-mail to ${m.to} queued; it is sent in a few seconds.` };
		} catch (e) {
			return refuseForm(form, e);
		}
	},
	retry: async function retry(event) {
		const member = requireRole(event, ...ISSUE_ROLES);
		const form = await readForm(event.request, retryFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		if (
			!(await requeueMail(member.organisationId, form.data.mailId, { dwellingId: event.params.dwellingId }))
		)
			error(404, 'No such message.');
		kickOutbox();
		return { done: 'The message is queued again.' };
	}
};
