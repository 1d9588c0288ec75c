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
import { ConflictError, ForbiddenError } from '$lib/server/errors';
import { templateU } from '../_u-value';

const NOT_FOUND = 'No such template in your organisation.';

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
		const input = templatePatchSchema.safeParse(values);
		if (!input.success) return fail(400, { values, errors: formErrors(input.error) });
		try {
			if (!(await updateTemplate(member, event.params.templateId, input.data))) error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof ConflictError) {
				return fail(409, { values, errors: { name: e.message } as Record<string, string> });
			}
			if (e instanceof ForbiddenError) return fail(403, { refused: e.message });
			throw e;
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
		try {
			if (!(await deleteTemplate(member, event.params.templateId))) error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof ForbiddenError) return fail(403, { refused: e.message });
			throw e;
		}
		redirect(303, '/templates');
	}
};
