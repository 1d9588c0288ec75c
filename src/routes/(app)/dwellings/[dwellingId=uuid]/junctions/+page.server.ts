import { fail } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { listElementSummaries } from '$lib/server/dwellings/elements';
import { deleteJunction, listJunctions } from '$lib/server/junctions';
import { summariseElements } from '$lib/dwellings/summary';
import { invalidText, readForm, refuseAction } from '$lib/server/forms';
import { deleteJunctionFormSchema } from '$lib/junctions/forms';
import { junctionPageContext } from './_context';

export const load = async (event) => {
	const member = requireMember(event);
	const ctx = await junctionPageContext(member, event.params.dwellingId);
	const [junctions, elements] = await Promise.all([
		listJunctions(member.organisationId, event.params.dwellingId),
		listElementSummaries(member.organisationId, event.params.dwellingId)
	]);
	const { totals } = summariseElements(elements, null);
	return {
		dwelling: ctx.dwelling,
		canEdit: ctx.canEdit,
		refusal: ctx.refusal,
		junctions,
		sumUA: elements.length ? totals.sumUA : null,
		climateName: ctx.climate?.name ?? null
	};
};

export const actions = {
	/** Delete one junction, checked against the version shown. */
	delete: async function remove(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, deleteJunctionFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			await deleteJunction(member, form.data.junctionId, form.data.version);
		} catch (e) {
			return refuseAction(e, (r) => r.message);
		}
		return { done: 'Junction deleted.' };
	}
};
