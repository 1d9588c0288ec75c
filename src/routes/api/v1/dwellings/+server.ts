import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createDwelling, listDwellings, WRITE_ROLES } from '$lib/server/dwellings';
import { answer, readJson } from '$lib/server/http';

/** The organisation's dwellings: ?q=&status=&assessorId=&sort=&dir=&page=&pageSize= */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		return json(await listDwellings(member.organisationId, Object.fromEntries(event.url.searchParams)));
	});

export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		const dwelling = await createDwelling(member, await readJson(event.request));
		return json(dwelling, { status: 201 });
	});
