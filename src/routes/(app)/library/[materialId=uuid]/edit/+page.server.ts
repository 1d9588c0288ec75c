import { error, fail, redirect } from '@sveltejs/kit';
import { setError } from 'sveltekit-superforms';
import { requireRole } from '$lib/server/guard';
import { getCurrentRevision, updateMaterial } from '$lib/server/library';
import { formFor, readForm } from '$lib/server/forms';
import { materialFormSchema, materialFormValues, materialInputFromForm } from '$lib/library/forms';
import { materialRefused, type MaterialFormRead } from '../../_material-refused';

export const load = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const material = await getCurrentRevision(member.organisationId, event.params.materialId);
	if (!material) error(404, 'No such material in your library.');
	return {
		material,
		materialForm: await formFor(materialFormSchema, {
			...materialFormValues(material),
			expectedRevisionId: material.revisionId
		})
	};
};

export const actions = {
	default: async function revise(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form: MaterialFormRead = await readForm(event.request, materialFormSchema);
		if (!form.valid) {
			if (form.errors.expectedRevisionId)
				setError(
					form,
					'',
					'The form did not say which revision it was opened on; reload the page and make your change again.'
				);
			return fail(400, { form });
		}
		try {
			const r = await updateMaterial(
				{ userId: member.user.id, organisationId: member.organisationId },
				event.params.materialId,
				materialInputFromForm(form.data),
				{
					confirmWarnings: form.data.confirmWarnings,
					expectedRevisionId: form.data.expectedRevisionId
				}
			);
			if (r.outcome === 'unchanged')
				return setError(form, '', 'Nothing changed, so no new revision was written.');
		} catch (e) {
			return materialRefused(form, e);
		}
		redirect(303, `/library/${event.params.materialId}`);
	}
};
