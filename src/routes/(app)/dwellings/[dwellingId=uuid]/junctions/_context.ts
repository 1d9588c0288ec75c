import { error } from '@sveltejs/kit';
import type { Member } from '$lib/server/guard';
import { getDwellingContext } from '$lib/server/dwellings/elements';
import { getJunctionInputs } from '$lib/server/junctions';
import { NotFoundError } from '$lib/server/errors';
import { changeRefusal } from '$lib/dwellings/rules';

/**
 * What every junction page of a dwelling reads: the dwelling, its elements as the builder reads them,
 * its climate, and whether the member may change it now (not a supervisor, not archived, not accepted
 * or awaiting review unless reopened).
 */
export async function junctionPageContext(member: Member, dwellingId: string) {
	try {
		const ctx = await getDwellingContext(member.organisationId, dwellingId);
		const { elements, climate } = await getJunctionInputs(member.organisationId, dwellingId);
		const refusal = changeRefusal(ctx.dwelling.status, ctx.dwelling.reopened);
		return {
			dwelling: ctx.dwelling,
			elements,
			climate: climate ? { name: climate.name, months: climate.months } : null,
			canEdit: member.role !== 'supervisor' && !refusal,
			refusal: refusal?.message ?? null
		};
	} catch (e) {
		if (e instanceof NotFoundError) error(404, 'No such dwelling.');
		throw e;
	}
}
