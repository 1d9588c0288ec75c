import { fail, redirect } from '@sveltejs/kit';
import { superValidate, setError } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import { requireRole } from '$lib/server/guard';
import { createDwelling, listDwellingOptions, WRITE_ROLES } from '$lib/server/dwellings';
import { dwellingFieldsFromForm, dwellingFormSchema } from '$lib/dwellings/forms';
import { ValidationError } from '$lib/server/errors';

export const load = async (event) => {
	const member = requireRole(event, ...WRITE_ROLES);
	const options = await listDwellingOptions(member.organisationId);
	const form = await superValidate(zod4(dwellingFormSchema), {
		defaults: {
			reference: '',
			address: '',
			programme: '',
			clientName: '',
			clientEmail: '',
			assessorId: member.role === 'assessor' ? member.user.id : '',
			stage: 'design' as const,
			limitTableId: '',
			climateId: options.climates[0]?.id ?? '',
			floorArea: '',
			version: 0
		}
	});
	return { form, options };
};

export const actions = {
	default: async function create(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await superValidate(event.request, zod4(dwellingFormSchema));
		if (!form.valid) return fail(400, { form });
		let id: string;
		try {
			const { version: _version, ...fields } = form.data;
			id = (await createDwelling(member, dwellingFieldsFromForm(fields))).id;
		} catch (e) {
			if (e instanceof ValidationError) {
				for (const i of e.issues) setError(form, i.path as 'reference', i.message);
				return fail(400, { form });
			}
			throw e;
		}
		redirect(303, `/dwellings/${id}`);
	}
};
