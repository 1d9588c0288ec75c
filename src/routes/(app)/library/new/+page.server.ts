import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { createMaterial, valuesFromForm } from '$lib/server/library';
import { materialRefused } from '../_material-refused';

export const load = (event) => {
	requireRole(event, 'assessor', 'admin');
	return {};
};

export const actions = {
	default: async function create(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const { raw, issues, confirmWarnings } = valuesFromForm(await event.request.formData());
		if (issues.length) return fail(400, { values: raw, issues, warnings: [] });
		let id: string;
		try {
			id = (
				await createMaterial({ userId: member.user.id, organisationId: member.organisationId }, raw, {
					confirmWarnings
				})
			).id;
		} catch (e) {
			return materialRefused(e, raw);
		}
		redirect(303, `/library/${id}`);
	}
};
