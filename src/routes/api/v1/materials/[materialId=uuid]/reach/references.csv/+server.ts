import { requireMember } from '$lib/server/guard';
import { answer } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';
import { toCsv } from '$lib/server/csv/write';
import { getReach, reachReferences } from '$lib/server/library/reach';

/** The references of the dwellings with elements on an older revision, as a CSV an audit batch reads. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const reach = await getReach(member.organisationId, event.params.materialId);
		if (!reach) throw new NotFoundError('No such material in your library.');
		const csv = toCsv(
			['reference'],
			reachReferences(reach).map((r) => [r])
		);
		return new Response(csv, {
			headers: {
				'content-type': 'text/csv; charset=utf-8',
				'content-disposition': `attachment; filename="${reach.material.code.replace(/[^\w.-]/g, '_')}-older-revisions.csv"`,
				'cache-control': 'private, no-store'
			}
		});
	});
