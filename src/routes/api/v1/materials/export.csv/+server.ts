import { requireMember } from '$lib/server/guard';
import { listAllCurrent } from '$lib/server/library';
import { materialsToCsv } from '$lib/server/library/import';

/** The whole library (current revisions) as CSV, in the columns the import reads. */
export const GET = async (event) => {
	const member = requireMember(event);
	const csv = materialsToCsv(await listAllCurrent(member.organisationId));
	const day = new Date().toISOString().slice(0, 10);
	return new Response(csv, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="library-${day}.csv"`,
			'cache-control': 'no-store'
		}
	});
};
