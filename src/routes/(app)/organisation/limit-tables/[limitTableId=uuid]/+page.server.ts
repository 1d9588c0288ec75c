import { error, fail, redirect } from '@sveltejs/kit';
import { message, setError } from 'sveltekit-superforms';
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
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { ConflictError, ValidationError } from '$lib/server/errors';
import { limitTableUpdateSchema } from '$lib/limit-tables/schema';
import {
	limitTableDeleteFormSchema,
	limitTableEditFormSchema,
	limitTableFieldOf,
	limitTableFormOf,
	limitTableUpdateFromForm,
	makeDefaultFormSchema
} from '$lib/limit-tables/forms';
import { fieldIssues } from '$lib/validation';

const NOT_FOUND = 'No such limit table in your organisation.';
/** The edit form always carries the version it was loaded with; without it the save cannot be checked. */
const NO_VERSION =
	'The form did not say which version of the limit table it was opened on; reload the page and try again.';

export const load = async (event) => {
	const member = requireMember(event);
	const table = await getLimitTable(member.organisationId, event.params.limitTableId);
	if (!table) error(404, NOT_FOUND);
	const [dwellings, usage, limitTableForm] = await Promise.all([
		listDwellingsNamingLimitTable(member.organisationId, table.id),
		limitTableUsage(member.organisationId, table.id),
		formFor(limitTableEditFormSchema, limitTableFormOf(table))
	]);
	const inUse = usage !== null && (usage.dwellings > 0 || usage.isDefault);
	return {
		table,
		dwellings,
		usage,
		limitTableForm,
		// shown beside the edit form; saving new limits then needs the confirmation box ticked
		changeWarning: inUse && usage ? limitChangeWarning(usage) : null,
		created: event.url.searchParams.has('created')
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, limitTableEditFormSchema);
		if (!form.valid) {
			if (form.errors.version) setError(form, NO_VERSION);
			return fail(400, { limitTableForm: form });
		}
		const input = limitTableUpdateSchema.safeParse(limitTableUpdateFromForm(form.data));
		if (!input.success) {
			return refuseForm(form, new ValidationError(fieldIssues(input.error)), { field: limitTableFieldOf });
		}
		let saved: Awaited<ReturnType<typeof updateLimitTable>>;
		try {
			saved = await updateLimitTable(member, event.params.limitTableId, input.data, {
				confirm: form.data.confirm
			});
		} catch (e) {
			// New limits on a table in use: the changes are listed and the box asks to be ticked.
			if (e instanceof LimitChangeNeedsConfirm) {
				const n = e.usage.dwellings;
				setError(
					form,
					'confirm',
					`Not saved: tick the box to confirm the new limits for ${n} dwelling${n === 1 ? '' : 's'}.`
				);
				return fail(409, { limitTableForm: form, changes: e.changes });
			}
			// A name already taken is told beside the name; a save made by someone else since this page was
			// loaded is the form's message; either way the form keeps what was typed.
			if (e instanceof ConflictError && e.current === undefined) {
				return setError(form, 'name', e.message, { status: 409 });
			}
			return refuseForm(form, e, { field: limitTableFieldOf });
		}
		if (!saved) error(404, NOT_FOUND);
		// The form goes on from what is stored now (and its new version).
		form.data = limitTableFormOf(saved);
		return message(form, 'Limit table saved.');
	},
	makeDefault: async function makeDefault(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, makeDefaultFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		if (!(await setDefaultLimitTable(member, event.params.limitTableId))) error(404, NOT_FOUND);
		return { done: "This is now the organisation's default limit table." };
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, limitTableDeleteFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			if (!(await deleteLimitTable(member, event.params.limitTableId, form.data.version)))
				error(404, NOT_FOUND);
		} catch (e) {
			return refuseAction(e);
		}
		redirect(303, '/organisation/limit-tables');
	}
};
