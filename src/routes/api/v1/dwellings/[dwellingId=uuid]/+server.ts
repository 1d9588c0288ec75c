import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteDwelling, getDwellingOverview, updateDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { answer, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The dwelling with its elements (U, limit, pass/fail, moisture) and fabric totals. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const overview = await getDwellingOverview(member.organisationId, event.params.dwellingId);
		if (!overview) throw new NotFoundError();
		return json(overview);
	});

/** Change details; the body carries `version` (409 when stale). */
export const PATCH = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		return json(await updateDwelling(member, event.params.dwellingId, await readJson(event.request)));
	});

/** Delete (only without reports or audits): ?version=N */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, ...WRITE_ROLES);
		await deleteDwelling(member, event.params.dwellingId, versionParam(event.url));
		return new Response(null, { status: 204 });
	});
