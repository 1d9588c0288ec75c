import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createLimitTable, listLimitTables } from '$lib/server/limit-tables';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

/** The organisation's limit tables, the default first. */
export const GET = async (event) => {
	const member = requireMember(event);
	return json({ items: await listLimitTables(member.organisationId) });
};

/** A new limit table (admins): `{ name, edition, dated?, source?, isDefault?, limits: { [kind]: maxU } }`. */
export const POST = async (event) => {
	const member = requireRole(event, 'admin');
	const input = limitTableInputSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'limit table');
	try {
		return json(await createLimitTable(member, input.data), { status: 201 });
	} catch (e) {
		return errorResponse(e);
	}
};
