import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { getDwellingContext } from '$lib/server/dwellings/elements';
import { listEditorClimates } from '$lib/server/dwellings';
import { ELEMENT_KINDS, type ElementKind } from '$lib/dwellings/kinds';
import { NotFoundError } from '$lib/server/errors';

export const load = async (event) => {
	const member = requireRole(event, ...WRITE_ROLES);
	const kindParam = event.url.searchParams.get('kind') ?? 'external-wall';
	const kind = (
		(ELEMENT_KINDS as readonly string[]).includes(kindParam) ? kindParam : 'external-wall'
	) as ElementKind;
	try {
		const ctx = await getDwellingContext(member.organisationId, event.params.dwellingId);
		return { ...ctx, kind, climates: await listEditorClimates(member.organisationId) };
	} catch (e) {
		if (e instanceof NotFoundError) error(404, 'No such dwelling.');
		throw e;
	}
};
