import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteTemplate, getTemplate, updateTemplate } from '$lib/server/templates';
import { templatePatchSchema } from '$lib/templates/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

const NOT_FOUND = 'No such template in your organisation.';

export const GET = async (event) => {
	const member = requireMember(event);
	const template = await getTemplate(member.organisationId, event.params.templateId);
	if (!template) error(404, NOT_FOUND);
	return json(template);
};

/** Changes any of name, kind, description, buildUp (its author or an admin). */
async function change(event: Parameters<typeof GET>[0]) {
	const member = requireRole(event, 'assessor', 'admin');
	if (!(await getTemplate(member.organisationId, event.params.templateId))) error(404, NOT_FOUND);
	const input = templatePatchSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'template');
	try {
		const template = await updateTemplate(member, event.params.templateId, input.data);
		if (!template) error(404, NOT_FOUND);
		return json(template);
	} catch (e) {
		return errorResponse(e);
	}
}
export const PATCH = change;
export const PUT = change;

/** Deletes the template (its author or an admin). */
export const DELETE = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	try {
		if (!(await deleteTemplate(member, event.params.templateId))) error(404, NOT_FOUND);
	} catch (e) {
		return errorResponse(e);
	}
	return new Response(null, { status: 204 });
};
