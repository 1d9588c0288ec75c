import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createTemplate, listTemplates } from '$lib/server/templates';
import { ELEMENT_KINDS, type ElementKind } from '$lib/dwellings/kinds';
import { templateInputSchema } from '$lib/templates/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

/** The organisation's templates, optionally of one element kind (`?kind=`) or matching `?q=`. */
export const GET = async (event) => {
	const member = requireMember(event);
	const kind = event.url.searchParams.get('kind');
	if (kind && !(ELEMENT_KINDS as readonly string[]).includes(kind)) {
		error(400, `kind must be one of ${ELEMENT_KINDS.join(', ')}.`);
	}
	const q = event.url.searchParams.get('q');
	return json({ items: await listTemplates(member.organisationId, kind as ElementKind | null, q) });
};

/** Saves a build-up as a template (assessors and admins): `{ name, kind, description?, buildUp }`. */
export const POST = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const input = templateInputSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'template');
	try {
		return json(await createTemplate(member, input.data), { status: 201 });
	} catch (e) {
		return errorResponse(e);
	}
};
