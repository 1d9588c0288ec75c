import { error, fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	LimitChangeNeedsConfirm,
	deleteLimitTable,
	getLimitTable,
	limitChangeWarning,
	limitTableUsage,
	listDwellingsNamingLimitTable,
	setDefaultLimitTable,
	updateLimitTable
} from '$lib/server/limit-tables';
import { limitTableUpdateSchema } from '$lib/limit-tables/schema';
import { formErrors } from '$lib/validation';
import { limitTableFormValues, limitTableUpdateFromForm } from '$lib/limit-tables/form';
import { ConflictError } from '$lib/server/errors';
import { nameTaken } from '../../../_name-taken';

const NOT_FOUND = 'No such limit table in your organisation.';
/** The edit form always carries the version it was loaded with; without it the save cannot be checked. */
const NO_VERSION =
	'The form did not say which version of the limit table it was opened on; reload the page and try again.';

export const load = async (event) => {
	const member = requireMember(event);
	const table = await getLimitTable(member.organisationId, event.params.limitTableId);
	if (!table) error(404, NOT_FOUND);
	const [dwellings, usage] = await Promise.all([
		listDwellingsNamingLimitTable(member.organisationId, table.id),
		limitTableUsage(member.organisationId, table.id)
	]);
	const inUse = usage !== null && (usage.dwellings > 0 || usage.isDefault);
	return {
		table,
		dwellings,
		usage,
		// shown beside the edit form; saving new limits then needs the confirmation box ticked
		changeWarning: inUse && usage ? limitChangeWarning(usage) : null,
		created: event.url.searchParams.has('created')
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'admin');
		const fd = await event.request.formData();
		const values = limitTableFormValues(fd);
		const input = limitTableUpdateSchema.safeParse(limitTableUpdateFromForm(fd));
		if (!input.success) {
			const errors = formErrors(input.error);
			return fail(400, { values, errors, refused: errors.version ? NO_VERSION : undefined });
		}
		try {
			const confirm = fd.get('confirm') === 'on';
			if (!(await updateLimitTable(member, event.params.limitTableId, input.data, { confirm })))
				error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof LimitChangeNeedsConfirm) {
				return fail(409, {
					values,
					changes: e.changes,
					errors: {
						confirm: `Not saved: tick the box to confirm the new limits for ${e.usage.dwellings} dwelling${e.usage.dwellings === 1 ? '' : 's'}.`
					} as Record<string, string>
				});
			}
			// Saved by someone else since this page was loaded: say so, and keep what was typed in the form.
			if (e instanceof ConflictError && e.current !== undefined) {
				return fail(409, { values, errors: {} as Record<string, string>, stale: e.message });
			}
			return nameTaken(e, { values });
		}
		return { done: 'Limit table saved.' };
	},
	makeDefault: async function makeDefault(event) {
		const member = requireRole(event, 'admin');
		if (!(await setDefaultLimitTable(member, event.params.limitTableId))) error(404, NOT_FOUND);
		return { done: "This is now the organisation's default limit table." };
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'admin');
		const version = Number((await event.request.formData()).get('version'));
		try {
			if (!(await deleteLimitTable(member, event.params.limitTableId, version))) error(404, NOT_FOUND);
		} catch (e) {
			if (e instanceof ConflictError) return fail(409, { refused: e.message });
			throw e;
		}
		redirect(303, '/organisation/limit-tables');
	}
};
