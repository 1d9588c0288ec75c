import { error, fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { deleteClimate, getClimate, getClimateUsage, updateClimate } from '$lib/server/climates';
import { climateInputSchema } from '$lib/climates/schema';
import { climateFromForm, climateFormValues } from '$lib/climates/form';
import { formErrors } from '$lib/validation';
import { ConflictError } from '$lib/server/errors';

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
		const input = climateInputSchema.safeParse(climateFromForm(fd));
		if (!input.success)
			return fail(400, { action: 'update' as const, values, errors: formErrors(input.error) });
		try {
			const climate = await updateClimate(member, event.params.climateId, input.data);
			if (!climate) error(404, 'No such climate in your organisation.');
		} catch (e) {
			if (e instanceof ConflictError) {
				return fail(409, {
					action: 'update' as const,
					values,
					errors: { name: e.message } as Record<string, string>
				});
			}
			throw e;
		}
		return { action: 'update' as const, done: 'Climate saved.' };
	},
	delete: async function remove(event) {
		const member = requireRole(event, 'admin');
		try {
			if (!(await deleteClimate(member, event.params.climateId))) {
				error(404, 'No such climate in your organisation.');
			}
		} catch (e) {
			if (e instanceof ConflictError) return fail(409, { action: 'delete' as const, refused: e.message });
			throw e;
		}
		redirect(303, '/climates');
	}
};
