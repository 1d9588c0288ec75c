import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { listTemplates } from '$lib/server/templates';
import { ELEMENT_KINDS, type ElementKind } from '$lib/dwellings/kinds';
import { templateU } from './_u-value';

export const load = async (event) => {
	const member = requireMember(event);
	const kindParam = event.url.searchParams.get('kind') || null;
	if (kindParam && !(ELEMENT_KINDS as readonly string[]).includes(kindParam))
		error(400, 'Unknown element kind.');
	const kind = kindParam as ElementKind | null;
	const q = event.url.searchParams.get('q') ?? '';
	const templates = await listTemplates(member.organisationId, kind, q);
	return {
		kind,
		q,
		templates: templates.map((t) => ({
			...t,
			totalMm: t.buildUp.layers.reduce((a, l) => a + l.thicknessMm, 0),
			...templateU(t.kind, t.buildUp)
		}))
	};
};
