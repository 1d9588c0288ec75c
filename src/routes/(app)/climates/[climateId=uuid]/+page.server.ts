import { error, fail, redirect } from '@sveltejs/kit';
import { message, setError } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteClimate, getClimate, getClimateUsage, updateClimate } from '$lib/server/climates';
import { formFor, invalidText, readForm, refuseAction, refuseForm } from '$lib/server/forms';
import { ConflictError, ValidationError } from '$lib/server/errors';
import { climateUpdateSchema } from '$lib/climates/schema';
import {
	climateDeleteFormSchema,
	climateEditFormSchema,
	climateFieldOf,
	climateFormOf,
	climateUpdateFromForm
} from '$lib/climates/forms';
import { fieldIssues } from '$lib/validation';

const NOT_FOUND = 'No such climate in your organisation.';
/** The edit form always carries the version it was loaded with; without it the save cannot be checked. */
const NO_VERSION =
	'The form did not say which version of the climate it was opened on; reload the page and try again.';

export const load = async (event) => {
	const member = requireMember(event);
	const climate = await getClimate(member.organisationId, event.params.climateId);
	if (!climate) error(404, NOT_FOUND);
	return {
		climate,
		usage: await getClimateUsage(member.organisationId, climate.id),
		created: event.url.searchParams.has('created'),
		climateForm: await formFor(climateEditFormSchema, climateFormOf(climate))
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, climateEditFormSchema);
		if (!form.valid) {
			if (form.errors.version) setError(form, NO_VERSION);
			return fail(400, { climateForm: form });
		}
		const input = climateUpdateSchema.safeParse(climateUpdateFromForm(form.data));
		if (!input.success) {
			return refuseForm(form, new ValidationError(fieldIssues(input.error)), { field: climateFieldOf });
		}
		let saved: Awaited<ReturnType<typeof updateClimate>>;
		try {
			saved = await updateClimate(member, event.params.climateId, input.data);
		} catch (e) {
			// A name already taken is told beside the name; a save made by someone else since this page was
			// loaded is the form's message; either way the form keeps what was typed.
			if (e instanceof ConflictError && e.current === undefined) {
				return setError(form, 'name', e.message, { status: 409 });
			}
			return refuseForm(form, e, { field: climateFieldOf });
		}
		if (!saved) error(404, NOT_FOUND);
		// The form goes on from what is stored now (and its new version).
		form.data = climateFormOf(saved);
		return message(form, 'Climate saved.');
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, climateDeleteFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		try {
			if (!(await deleteClimate(member, event.params.climateId, form.data.version))) error(404, NOT_FOUND);
		} catch (e) {
			return refuseAction(e);
		}
		redirect(303, '/climates');
	}
};
