import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { createElement, listElementSummaries } from '$lib/server/dwellings/elements';
import { handle, readJson } from '$lib/dwellings/api';
import { NotFoundError } from '$lib/dwellings/errors';

export const GET = (event) =>
	handle(async () => {
		const member = requireMember(event);
		if (!(await getDwelling(member.organisationId, event.params.dwellingId))) throw new NotFoundError();
		return json({ items: await listElementSummaries(member.organisationId, event.params.dwellingId) });
	});

/** Add an element; the server computes and stores the result (the authority). */
export const POST = (event) =>
	handle(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		const element = await createElement(member, event.params.dwellingId, await readJson(event.request));
		return json(element, { status: 201 });
	});
