import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteClimate, getClimate, getClimateUsage, updateClimate } from '$lib/server/climates';
import { climateInputSchema } from '$lib/climates/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

const NOT_FOUND = 'No such climate in your organisation.';

export const GET = async (event) => {
	const member = requireMember(event);
	const climate = await getClimate(member.organisationId, event.params.climateId);
	if (!climate) error(404, NOT_FOUND);
	return json({ ...climate, usage: await getClimateUsage(member.organisationId, climate.id) });
};

/** Replaces the climate's name, source, flag and months (admins). */
export const PUT = async (event) => {
	const member = requireRole(event, 'admin');
	if (!(await getClimate(member.organisationId, event.params.climateId))) error(404, NOT_FOUND);
	const input = climateInputSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'climate');
	try {
		const climate = await updateClimate(member, event.params.climateId, input.data);
		if (!climate) error(404, NOT_FOUND);
		return json(climate);
	} catch (e) {
		return errorResponse(e);
	}
};

/** Deletes a climate no dwelling or element uses (admins); 409 when one does. */
export const DELETE = async (event) => {
	const member = requireRole(event, 'admin');
	try {
		if (!(await deleteClimate(member, event.params.climateId))) error(404, NOT_FOUND);
	} catch (e) {
		return errorResponse(e);
	}
	return new Response(null, { status: 204 });
};
