import { error, fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteClimate, getClimate, getClimateUsage, updateClimate } from '$lib/server/climates';
import { climateUpdateSchema } from '$lib/climates/schema';
import { climateFormValues, climateUpdateFromForm } from '$lib/climates/form';
import { formErrors } from '$lib/validation';
import { ConflictError } from '$lib/server/errors';
import { nameTaken } from '../../_name-taken';

/** The edit form always carries the version it was loaded with; without it the save cannot be checked. */
const NO_VERSION =
	'The form did not say which version of the climate it was opened on; reload the page and try again.';

export const load = async (event) => {
	const member = requireMember(event);
	const climate = await getClimate(member.organisationId, event.params.climateId);
	if (!climate) error(404, 'No such climate in your organisation.');
	return {
		climate,
		usage: await getClimateUsage(member.organisationId, climate.id),
		created: event.url.searchParams.has('created')
	};
};

export const actions = {
	update: async function update(event) {
		const member = requireRole(event, 'admin');
		const fd = await event.request.formData();
		const values = climateFormValues(fd);
		const input = climateUpdateSchema.safeParse(climateUpdateFromForm(fd));
		if (!input.success) {
			const errors = formErrors(input.error);
			return fail(400, {
				action: 'update' as const,
				values,
				errors,
				refused: errors.version ? NO_VERSION : undefined
			});
		}
		try {
			const climate = await updateClimate(member, event.params.climateId, input.data);
			if (!climate) error(404, 'No such climate in your organisation.');
		} catch (e) {
			// Saved by someone else since this page was loaded: say so, and keep what was typed in the form.
			if (e instanceof ConflictError && e.current !== undefined) {
				return fail(409, {
					action: 'update' as const,
					values,
					errors: {} as Record<string, string>,
					stale: e.message
				});
			}
			return nameTaken(e, { action: 'update' as const, values });
		}
		return { action: 'update' as const, done: 'Climate saved.' };
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'admin');
		const version = Number((await event.request.formData()).get('version'));
		try {
			if (!(await deleteClimate(member, event.params.climateId, version))) {
				error(404, 'No such climate in your organisation.');
			}
		} catch (e) {
			if (e instanceof ConflictError) return fail(409, { action: 'delete' as const, refused: e.message });
			throw e;
		}
		redirect(303, '/climates');
	}
};
