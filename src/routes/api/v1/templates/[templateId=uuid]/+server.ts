import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteTemplate, getTemplate, updateTemplate } from '$lib/server/templates';
import { templatePatchSchema } from '$lib/templates/schema';
import { answer, parseWith, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

const NOT_FOUND = 'No such template in your organisation.';

export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const template = await getTemplate(member.organisationId, event.params.templateId);
		if (!template) throw new NotFoundError(NOT_FOUND);
		return json(template);
	});

/**
 * Changes any of name, kind, description, buildUp (its author or an admin). The body carries `version`,
 * the one the caller loaded: 409 with `currentVersion` when somebody saved in between.
 */
const change = (event: Parameters<typeof GET>[0]) =>
	answer(async () => {
		const member = requireRole(event, 'assessor', 'admin');
		if (!(await getTemplate(member.organisationId, event.params.templateId)))
			throw new NotFoundError(NOT_FOUND);
		const input = parseWith(templatePatchSchema, await readJson(event.request), 'template');
		const template = await updateTemplate(member, event.params.templateId, input);
		if (!template) throw new NotFoundError(NOT_FOUND);
		return json(template);
	});
export const PATCH = change;
export const PUT = change;

/** Deletes the template (its author or an admin): ?version=N; 409 when stale. */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, 'assessor', 'admin');
		if (!(await getTemplate(member.organisationId, event.params.templateId)))
			throw new NotFoundError(NOT_FOUND);
		if (!(await deleteTemplate(member, event.params.templateId, versionParam(event.url)))) {
			throw new NotFoundError(NOT_FOUND);
		}
		return new Response(null, { status: 204 });
	});
