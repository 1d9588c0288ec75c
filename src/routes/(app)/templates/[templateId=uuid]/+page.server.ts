import { error, fail, redirect } from '@sveltejs/kit';
import { message, setError } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	canEditTemplate,
	createTemplate,
	deleteTemplate,
	getTemplate,
	updateTemplate
} from '$lib/server/templates';
import {
	templateCopyFormSchema,
	templateDeleteFormSchema,
	templateFieldOf,
	templateFormSchema,
	templateFormValues,
	templatePatchFromForm
} from '$lib/templates/forms';
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { ConflictError } from '$lib/server/errors';
import { templateU } from '../_u-value';

const NOT_FOUND = 'No such template in your organisation.';
/** The edit form always carries the version it was loaded with; without it the save cannot be checked. */
const NO_VERSION =
	'The form did not say which version of the template it was opened on; reload the page and try again.';

export const load = async (event) => {
	const member = requireMember(event);
	const template = await getTemplate(member.organisationId, event.params.templateId);
	if (!template) error(404, NOT_FOUND);
	return {
		template,
		templateForm: await formFor(templateFormSchema, templateFormValues(template)),
		u: templateU(template.kind, template.buildUp),
		canEdit: canEditTemplate(member, template),
		canCopy: member.role !== 'supervisor'
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form = await readForm(event.request, templateFormSchema);
		if (!form.valid) {
			if (form.errors.version) setError(form, '', NO_VERSION);
			return fail(400, { form });
		}
		try {
			const saved = await updateTemplate(member, event.params.templateId, templatePatchFromForm(form.data));
			if (!saved) error(404, NOT_FOUND);
			form.data.version = saved.version;
		} catch (e) {
			if (e instanceof ConflictError) {
				// Saved by someone else since this page was loaded: say so, and keep what was typed in the form.
				if (e.current !== undefined) return fail(409, { form, stale: e.message });
				// the name is taken in the organisation
				return setError(form, 'name', e.message, { status: 409 });
			}
			return refuseForm(form, e, { field: templateFieldOf });
		}
		return message(form, 'Template saved.');
	},
	copy: async function copy(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form = await readForm(event.request, templateCopyFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		const t = await getTemplate(member.organisationId, event.params.templateId);
		if (!t) error(404, NOT_FOUND);
		let id: string | null = null;
		for (let n = 1; n <= 20 && !id; n++) {
			const name = `${t.name} (copy${n === 1 ? '' : ` ${n}`})`.slice(0, 120);
			try {
				id = (
					await createTemplate(member, { name, kind: t.kind, description: t.description, buildUp: t.buildUp })
				).id;
			} catch (e) {
				if (!(e instanceof ConflictError)) throw e;
			}
		}
		if (!id) return fail(409, { error: 'Too many copies of this template already; rename some first.' });
		redirect(303, `/templates/${id}`);
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form = await readForm(event.request, templateDeleteFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			if (!(await deleteTemplate(member, event.params.templateId, form.data.version))) error(404, NOT_FOUND);
		} catch (e) {
			return refuseAction(e, (refusal) => refusal.message);
		}
		redirect(303, '/templates');
	}
};
