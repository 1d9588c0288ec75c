import { error, fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	canEditTemplate,
	createTemplate,
	deleteTemplate,
	getTemplate,
	updateTemplate
} from '$lib/server/templates';
import { templatePatchSchema } from '$lib/templates/schema';
import { formErrors } from '$lib/validation';
import { formNumber } from '$lib/forms';
import { ConflictError, ForbiddenError } from '$lib/server/errors';
import { templateU } from '../_u-value';
import { nameTaken } from '../../_name-taken';

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
		u: templateU(template.kind, template.buildUp),
		canEdit: canEditTemplate(member, template),
		canCopy: member.role !== 'supervisor'
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const fd = await event.request.formData();
		const values = {
			name: String(fd.get('name') ?? ''),
			kind: String(fd.get('kind') ?? ''),
			description: String(fd.get('description') ?? '')
		};
		const input = templatePatchSchema.safeParse({ ...values, version: formNumber(fd.get('version')) });
		if (!input.success) {
			const errors = formErrors(input.error);
			return fail(400, { values, errors, refused: errors.version ? NO_VERSION : undefined });
		}
		try {
			if (!(await updateTemplate(member, event.params.templateId, input.data))) error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof ForbiddenError) return fail(403, { refused: e.message });
			// Saved by someone else since this page was loaded: say so, and keep what was typed in the form.
			if (e instanceof ConflictError && e.current !== undefined) {
				return fail(409, { values, errors: {} as Record<string, string>, stale: e.message });
			}
			return nameTaken(e, { values });
		}
		return { done: 'Template saved.' };
	},
	copy: async function copy(event) {
		const member = requireRole(event, 'assessor', 'admin');
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
		if (!id) return fail(409, { refused: 'Too many copies of this template already; rename some first.' });
		redirect(303, `/templates/${id}`);
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const version = Number((await event.request.formData()).get('version'));
		try {
			if (!(await deleteTemplate(member, event.params.templateId, version))) error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof ForbiddenError) return fail(403, { refused: e.message });
			if (e instanceof ConflictError) return fail(409, { refused: e.message });
			throw e;
		}
		redirect(303, '/templates');
	}
};
