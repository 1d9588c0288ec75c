import { requireMember } from '$lib/server/guard';

/** A blank-shaped example of the climate CSV, with invented figures. */
export const GET = (event) => {
	requireMember(event);
	const rows = [
		[1, 3.0, 88],
		[2, 3.4, 85],
		[3, 5.2, 82],
		[4, 7.6, 78],
		[5, 10.8, 76],
		[6, 13.7, 76],
		[7, 15.6, 77],
		[8, 15.3, 79],
		[9, 13.0, 82],
		[10, 9.8, 85],
		[11, 6.2, 88],
		[12, 3.8, 89]
	];
	const body = 'month,temperature,relative_humidity\n' + rows.map((r) => r.join(',')).join('\n') + '\n';
	return new Response(body, {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': 'attachment; filename="climate-example-invented.csv"'
		}
	});
};
