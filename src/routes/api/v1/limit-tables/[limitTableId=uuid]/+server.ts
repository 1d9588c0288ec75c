import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteLimitTable, getLimitTable, updateLimitTable } from '$lib/server/limit-tables';
import { limitTableInputSchema } from '$lib/climates/schema';
import { invalid, readJson, refusal } from '$lib/climates/http';

const NOT_FOUND = 'No such limit table in your organisation.';

export const GET = async (event) => {
	const member = requireMember(event);
	const table = await getLimitTable(member.organisationId, event.params.limitTableId);
	if (!table) error(404, NOT_FOUND);
	return json(table);
};

/** Replaces the table's fields (admins); `isDefault: true` makes it the default. */
export const PUT = async (event) => {
	const member = requireRole(event, 'admin');
	if (!(await getLimitTable(member.organisationId, event.params.limitTableId))) error(404, NOT_FOUND);
	const input = limitTableInputSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'limit table');
	try {
		const table = await updateLimitTable(member, event.params.limitTableId, input.data);
		if (!table) error(404, NOT_FOUND);
		return json(table);
	} catch (e) {
		return refusal(e);
	}
};

/** Deletes a table no dwelling uses (admins); 409 when one does, or when it is the default. */
export const DELETE = async (event) => {
	const member = requireRole(event, 'admin');
	try {
		if (!(await deleteLimitTable(member, event.params.limitTableId))) error(404, NOT_FOUND);
	} catch (e) {
		return refusal(e);
	}
	return new Response(null, { status: 204 });
};
