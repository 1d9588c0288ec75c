import { fail, redirect } from '@sveltejs/kit';
import { formFor, readForm, refuseForm } from '$lib/server/forms';
import { requireRole } from '$lib/server/guard';
import { createDwelling, listDwellingOptions, WRITE_ROLES } from '$lib/server/dwellings';
import { dwellingFieldsFromForm, dwellingFormSchema } from '$lib/dwellings/forms';

export const load = async (event) => {
	const member = requireRole(event, ...WRITE_ROLES);
	const options = await listDwellingOptions(member.organisationId);
	const form = await formFor(dwellingFormSchema, {
		reference: '',
		address: '',
		programme: '',
		clientName: '',
		clientEmail: '',
		assessorId: member.role === 'assessor' ? member.user.id : '',
		stage: 'design',
		limitTableId: '',
		climateId: options.climates[0]?.id ?? '',
		floorArea: '',
		version: 0
	});
	return { form, options };
};

export const actions = {
	default: async function create(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const form = await readForm(event.request, dwellingFormSchema);
		if (!form.valid) return fail(400, { form });
		let id: string;
		try {
			const { version: _version, ...fields } = form.data;
			id = (await createDwelling(member, dwellingFieldsFromForm(fields))).id;
		} catch (e) {
			return refuseForm(form, e);
		}
		redirect(303, `/dwellings/${id}`);
	}
};
