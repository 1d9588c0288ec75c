import { error, fail } from '@sveltejs/kit';
import { message } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	answerEvidenceRequest,
	deleteEvidence,
	EVIDENCE_WRITE_ROLES,
	evidencePanel,
	openEvidenceUpload,
	requestEvidence,
	uploadEvidence
} from '$lib/server/evidence';
import { invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { DECIDER_ROLES } from '$lib/audit/rules';
import {
	EVIDENCE_REQUEST_FORM_ID,
	evidenceAnswerFormSchema,
	evidenceDeleteFormSchema,
	evidenceRequestFormSchema,
	evidenceRequestFromForm
} from '$lib/evidence/forms';

export const load = async (event) => {
	const member = requireMember(event);
	const panel = await evidencePanel(member, event.params.dwellingId);
	if (!panel) error(404, 'No such dwelling.');
	return { panel };
};

/** The form's "For" choice (`dwelling`, `<elementId>` or `<elementId>:<layerIndex>`) as the API's fields. */
function targetFields(fields: Map<string, string>) {
	const target = fields.get('for');
	if (!target || target === 'dwelling') return;
	const [elementId, layerIndex] = target.split(':');
	fields.set('elementId', elementId);
	if (layerIndex !== undefined) fields.set('layerIndex', layerIndex);
}

/*
 * The forms are posted from other pages too (the dwelling, an element, an audit item), which show the
 * answer beside the form: `{ done }` or `{ error }`, and the request form's own errors and message.
 */
export const actions = {
	/** One file, read as it arrives (the form sends "for" before the file). */
	upload: async function upload(event) {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		try {
			const upload = await openEvidenceUpload(event.request, event.url);
			try {
				targetFields(upload.fields);
				const stored = await uploadEvidence(member, event.params.dwellingId, upload);
				return { done: `Uploaded “${stored.name}”.`, name: stored.name, id: stored.id };
			} finally {
				await upload.finish();
			}
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
	},

	delete: async function remove(event) {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		const form = await readForm(event.request, evidenceDeleteFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			await deleteEvidence(member, form.data.evidenceId);
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
		return { done: 'Deleted.' };
	},

	/** A supervisor's request, from the audit item page. */
	request: async function request(event) {
		const member = requireRole(event, ...DECIDER_ROLES);
		const form = await readForm(event.request, evidenceRequestFormSchema, EVIDENCE_REQUEST_FORM_ID);
		if (!form.valid) return fail(400, { requestForm: form });
		try {
			await requestEvidence(member, form.data.itemId, evidenceRequestFromForm(form.data));
		} catch (e) {
			return refuseForm(form, e);
		}
		return message(form, 'Requested: the assessor sees it beside the dwelling’s evidence.');
	},

	answer: async function answerRequest(event) {
		const member = requireMember(event);
		const form = await readForm(event.request, evidenceAnswerFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			await answerEvidenceRequest(member, form.data.itemId, form.data.requestId, {});
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
		return { done: 'Marked as answered.' };
	}
};
