import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getElementContext } from '$lib/server/dwellings/elements';
import { listEditorClimates } from '$lib/server/dwellings';

export const load = async (event) => {
	const member = requireMember(event);
	const ctx = await getElementContext(member.organisationId, event.params.elementId);
	if (!ctx || ctx.element.dwellingId !== event.params.dwellingId) error(404, 'No such element.');
	return {
		...ctx,
		climates: await listEditorClimates(member.organisationId),
		canEdit: member.role !== 'supervisor'
	};
};
