import { error, json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { setDefaultLimitTable } from '$lib/server/limit-tables';

/** Makes the table the organisation's default (admins). */
export const POST = async (event) => {
	const member = requireRole(event, 'admin');
	const table = await setDefaultLimitTable(member, event.params.limitTableId);
	if (!table) error(404, 'No such limit table in your organisation.');
	return json(table);
};
