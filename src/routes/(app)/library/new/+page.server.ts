import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { createMaterial } from '$lib/server/library';
import { formFor, readForm } from '$lib/server/forms';
import { materialFormSchema, materialFormValues, materialInputFromForm } from '$lib/library/forms';
import { materialRefused, type MaterialFormRead } from '../_material-refused';

export const load = async (event) => {
	requireRole(event, 'assessor', 'admin');
	return {
		materialForm: await formFor(
			materialFormSchema,
			materialFormValues({ category: 'insulation', lambdaKind: 'declared' })
		)
	};
};

export const actions = {
	default: async function create(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form: MaterialFormRead = await readForm(event.request, materialFormSchema);
		if (!form.valid) return fail(400, { form });
		let id: string;
		try {
			id = (
				await createMaterial(
					{ userId: member.user.id, organisationId: member.organisationId },
					materialInputFromForm(form.data),
					{ confirmWarnings: form.data.confirmWarnings }
				)
			).id;
		} catch (e) {
			return materialRefused(form, e);
		}
		redirect(303, `/library/${id}`);
	}
};
