import { error, fail } from '@sveltejs/kit';
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
import { AppError } from '$lib/server/errors';
import { DECIDER_ROLES } from '$lib/audit/rules';

export const load = async (event) => {
	const member = requireMember(event);
	const panel = await evidencePanel(member, event.params.dwellingId);
	if (!panel) error(404, 'No such dwelling.');
	return { panel };
};

/**
 * An expected refusal as the form's answer (`message`): the forms are posted from other pages too (the
 * dwelling, an element, an audit item), which show it beside the form.
 */
function refused(e: unknown, form: string) {
	if (!(e instanceof AppError)) throw e;
	return fail(e.status, { form, message: e.message });
}

/** The form's "For" choice (`dwelling`, `<elementId>` or `<elementId>:<layerIndex>`) as the API's fields. */
function targetFields(fields: Map<string, string>) {
	const target = fields.get('for');
	if (!target || target === 'dwelling') return;
	const [elementId, layerIndex] = target.split(':');
	fields.set('elementId', elementId);
	if (layerIndex !== undefined) fields.set('layerIndex', layerIndex);
}

export const actions = {
	/** One file, read as it arrives (the form sends "for" before the file). */
	upload: async function upload(event) {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		try {
			const upload = await openEvidenceUpload(event.request, event.url);
			try {
				targetFields(upload.fields);
				const stored = await uploadEvidence(member, event.params.dwellingId, upload);
				return { form: 'upload', name: stored.name, id: stored.id };
			} finally {
				await upload.finish();
			}
		} catch (e) {
			return refused(e, 'upload');
		}
	},

	delete: async function remove(event) {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		const data = await event.request.formData();
		try {
			await deleteEvidence(member, String(data.get('evidenceId') ?? ''));
		} catch (e) {
			return refused(e, 'delete');
		}
		return { form: 'delete' };
	},

	/** A supervisor's request, from the audit item page. */
	request: async function request(event) {
		const member = requireRole(event, ...DECIDER_ROLES);
		const data = await event.request.formData();
		try {
			await requestEvidence(member, String(data.get('itemId') ?? ''), {
				note: String(data.get('note') ?? ''),
				dueDate: String(data.get('dueDate') ?? '')
			});
		} catch (e) {
			return refused(e, 'request');
		}
		return { form: 'request' };
	},

	answer: async function answerRequest(event) {
		const member = requireMember(event);
		const data = await event.request.formData();
		try {
			await answerEvidenceRequest(
				member,
				String(data.get('itemId') ?? ''),
				String(data.get('requestId') ?? ''),
				{}
			);
		} catch (e) {
			return refused(e, 'answer');
		}
		return { form: 'answer' };
	}
};
