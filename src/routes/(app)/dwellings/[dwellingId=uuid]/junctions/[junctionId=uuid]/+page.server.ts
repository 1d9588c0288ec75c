import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getJunction } from '$lib/server/junctions';
import { junctionPageContext } from '../_context';

export const load = async (event) => {
	const member = requireMember(event);
	const junction = await getJunction(member.organisationId, event.params.junctionId);
	if (!junction || junction.dwellingId !== event.params.dwellingId) error(404, 'No such junction.');
	const ctx = await junctionPageContext(member, event.params.dwellingId);
	// an element the stored result was built from that has changed since (a save computes it again)
	const changed = (junction.lastResult?.elements ?? []).filter(
		(u) => ctx.elements.find((e) => e.id === u.id)?.version !== u.version
	);
	return { ...ctx, junction, changed, saved: event.url.searchParams.has('saved') };
};
