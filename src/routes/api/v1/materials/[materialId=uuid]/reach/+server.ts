import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { answer, parseWith } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';
import { getReach, reachPage, reachQuerySchema } from '$lib/server/library/reach';

/**
 * Every element of the organisation on an older revision of the material, grouped by dwelling (one page
 * of dwellings; the totals are over all of them), with its U now and with the current revision, the
 * limit, whether pass/fail or the moisture outcome would change, and each dwelling's status and reports.
 */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const q = parseWith(reachQuerySchema, Object.fromEntries(event.url.searchParams), 'query');
		const reach = await getReach(member.organisationId, event.params.materialId);
		if (!reach) throw new NotFoundError('No such material in your library.');
		return json(reachPage(reach, q.page, q.pageSize));
	});
