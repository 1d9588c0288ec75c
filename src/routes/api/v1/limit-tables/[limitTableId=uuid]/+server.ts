import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { z } from 'zod';
import {
	LimitChangeNeedsConfirm,
	deleteLimitTable,
	getLimitTable,
	updateLimitTable
} from '$lib/server/limit-tables';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import { errorResponse, invalid, readJson } from '$lib/server/http';

const NOT_FOUND = 'No such limit table in your organisation.';

export const GET = async (event) => {
	const member = requireMember(event);
	const table = await getLimitTable(member.organisationId, event.params.limitTableId);
	if (!table) error(404, NOT_FOUND);
	return json(table);
};

const putSchema = limitTableInputSchema.extend({
	confirm: z.boolean({ error: 'confirm must be true or false' }).optional()
});

/**
 * Replaces the table's fields (admins); `isDefault: true` makes it the default. New limits on a table
 * that dwellings are judged against (or on the default) need `confirm: true`: without it the answer is
 * 409 with `needsConfirm`, the number of dwellings and the changed limits, and nothing is saved.
 */
export const PUT = async (event) => {
	const member = requireRole(event, 'admin');
	if (!(await getLimitTable(member.organisationId, event.params.limitTableId))) error(404, NOT_FOUND);
	const input = putSchema.safeParse(await readJson(event.request));
	if (!input.success) return invalid(input.error, 'limit table');
	const { confirm, ...fields } = input.data;
	try {
		const table = await updateLimitTable(member, event.params.limitTableId, fields, { confirm });
		if (!table) error(404, NOT_FOUND);
		return json(table);
	} catch (e) {
		if (e instanceof LimitChangeNeedsConfirm) {
			return json(
				{
					message: e.message,
					needsConfirm: true,
					dwellings: e.usage.dwellings,
					usage: e.usage,
					changes: e.changes
				},
				{ status: 409 }
			);
		}
		return errorResponse(e);
	}
};

/** Deletes a table no dwelling uses (admins); 409 when one does, or when it is the default. */
export const DELETE = async (event) => {
	const member = requireRole(event, 'admin');
	try {
		if (!(await deleteLimitTable(member, event.params.limitTableId))) error(404, NOT_FOUND);
	} catch (e) {
		return errorResponse(e);
	}
	return new Response(null, { status: 204 });
};
