import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { z } from 'zod';
import {
	LimitChangeNeedsConfirm,
	deleteLimitTable,
	getLimitTable,
	updateLimitTable
} from '$lib/server/limit-tables';
import { limitTableUpdateSchema } from '$lib/limit-tables/schema';
import { answer, parseWith, readJson, versionParam } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

const NOT_FOUND = 'No such limit table in your organisation.';

export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const table = await getLimitTable(member.organisationId, event.params.limitTableId);
		if (!table) throw new NotFoundError(NOT_FOUND);
		return json(table);
	});

const putSchema = limitTableUpdateSchema.extend({
	confirm: z.boolean({ error: 'confirm must be true or false' }).optional()
});

/**
 * Replaces the table's fields (admins); `isDefault: true` makes it the default. The body carries
 * `version`, the one the caller loaded: 409 with `currentVersion` when somebody saved in between. New
 * limits on a table that dwellings are judged against (or on the default) need `confirm: true`: without
 * it the answer is 409 with `needsConfirm`, the number of dwellings and the changed limits, and nothing
 * is saved.
 */
export const PUT = (event) =>
	answer(async () => {
		const member = requireRole(event, 'admin');
		if (!(await getLimitTable(member.organisationId, event.params.limitTableId))) {
			throw new NotFoundError(NOT_FOUND);
		}
		const { confirm, ...fields } = parseWith(putSchema, await readJson(event.request), 'limit table');
		try {
			const table = await updateLimitTable(member, event.params.limitTableId, fields, { confirm });
			if (!table) throw new NotFoundError(NOT_FOUND);
			return json(table);
		} catch (e) {
			if (!(e instanceof LimitChangeNeedsConfirm)) throw e;
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
	});

/** Deletes a table no dwelling uses (admins): ?version=N; 409 when one does, when it is the default, or when stale. */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, 'admin');
		if (!(await getLimitTable(member.organisationId, event.params.limitTableId))) {
			throw new NotFoundError(NOT_FOUND);
		}
		if (!(await deleteLimitTable(member, event.params.limitTableId, versionParam(event.url)))) {
			throw new NotFoundError(NOT_FOUND);
		}
		return new Response(null, { status: 204 });
	});
