import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteClimate, getClimate, getClimateUsage, updateClimate } from '$lib/server/climates';
import { climateUpdateSchema } from '$lib/climates/schema';
import { answer, parseWith, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

const NOT_FOUND = 'No such climate in your organisation.';

export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const climate = await getClimate(member.organisationId, event.params.climateId);
		if (!climate) throw new NotFoundError(NOT_FOUND);
		return json({ ...climate, usage: await getClimateUsage(member.organisationId, climate.id) });
	});

/**
 * Replaces the climate's name, source, flag and months (admins). The body carries `version`, the one the
 * caller loaded: 409 with `currentVersion` when somebody saved in between.
 */
export const PUT = (event) =>
	answer(async () => {
		const member = requireRole(event, 'admin');
		if (!(await getClimate(member.organisationId, event.params.climateId)))
			throw new NotFoundError(NOT_FOUND);
		const input = parseWith(climateUpdateSchema, await readJson(event.request), 'climate');
		const climate = await updateClimate(member, event.params.climateId, input);
		if (!climate) throw new NotFoundError(NOT_FOUND);
		return json(climate);
	});

/** Deletes a climate no dwelling or element uses (admins): ?version=N; 409 when one does, or when stale. */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, 'admin');
		if (!(await getClimate(member.organisationId, event.params.climateId)))
			throw new NotFoundError(NOT_FOUND);
		if (!(await deleteClimate(member, event.params.climateId, versionParam(event.url)))) {
			throw new NotFoundError(NOT_FOUND);
		}
		return new Response(null, { status: 204 });
	});
