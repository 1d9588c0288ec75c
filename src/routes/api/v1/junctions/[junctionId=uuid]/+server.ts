import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { WRITE_ROLES } from '$lib/server/dwellings';
import { deleteJunction, getJunction, updateJunction } from '$lib/server/junctions';
import { answer, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The junction with its model, choices and stored result. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const junction = await getJunction(member.organisationId, event.params.junctionId);
		if (!junction) throw new NotFoundError('No such junction.');
		return json(junction);
	});

/** Replace the junction's fields; the body carries `version` (409 when stale). The server recomputes. */
export const PUT = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await updateJunction(member, event.params.junctionId, await readJson(event.request)));
	});

/** ?version=N */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		await deleteJunction(member, event.params.junctionId, versionParam(event.url));
		return new Response(null, { status: 204 });
	});
