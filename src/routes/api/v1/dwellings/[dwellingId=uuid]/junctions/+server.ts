import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { createJunction, listJunctions } from '$lib/server/junctions';
import { answer, readJson } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The dwelling's junctions: length, ψ used (calculated or entered, with its source) and fRsi. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		if (!(await getDwelling(member.organisationId, event.params.dwellingId))) throw new NotFoundError();
		return json({ items: await listJunctions(member.organisationId, event.params.dwellingId) });
	});

/** Add a junction; the server builds the model from the dwelling's elements, computes and stores it. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		const junction = await createJunction(member, event.params.dwellingId, await readJson(event.request));
		return json(junction, { status: 201 });
	});
