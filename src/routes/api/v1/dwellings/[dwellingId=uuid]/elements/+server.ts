import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { createElement, listElementSummaries } from '$lib/server/dwellings/elements';
import { answer, readJson } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		if (!(await getDwelling(member.organisationId, event.params.dwellingId))) throw new NotFoundError();
		return json({ items: await listElementSummaries(member.organisationId, event.params.dwellingId) });
	});

/** Add an element; the server computes and stores the result (the authority). */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		const element = await createElement(member, event.params.dwellingId, await readJson(event.request));
		return json(element, { status: 201 });
	});
