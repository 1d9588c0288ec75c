import { error } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { JUNCTION_TYPES, type JunctionType } from '$lib/junctions/kinds';
import { junctionPageContext } from '../_context';

export const load = async (event) => {
	const member = requireRole(event, ...WRITE_ROLES);
	const ctx = await junctionPageContext(member, event.params.dwellingId);
	if (!ctx.canEdit) error(409, ctx.refusal ?? 'This dwelling cannot change now.');
	const wanted = event.url.searchParams.get('type') ?? 'external-corner';
	const type = (
		(JUNCTION_TYPES as readonly string[]).includes(wanted) ? wanted : 'external-corner'
	) as JunctionType;
	return { ...ctx, type };
};
