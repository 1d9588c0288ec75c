import { error, fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { getCurrentRevision, updateMaterial, valuesFromForm } from '$lib/server/library';
import { materialRefused } from '../../_material-refused';

export const load = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const material = await getCurrentRevision(member.organisationId, event.params.materialId);
	if (!material) error(404, 'No such material in your library.');
	return { material };
};

export const actions = {
	default: async function revise(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const fd = await event.request.formData();
		const { raw, issues, confirmWarnings } = valuesFromForm(fd);
		if (issues.length) return fail(400, { values: raw, issues, warnings: [] });
		const expected = fd.get('expectedRevisionId');
		try {
			const r = await updateMaterial(
				{ userId: member.user.id, organisationId: member.organisationId },
				event.params.materialId,
				raw,
				{
					confirmWarnings,
					expectedRevisionId: typeof expected === 'string' && expected ? expected : undefined
				}
			);
			if (r.outcome === 'unchanged')
				return fail(400, {
					values: raw,
					issues: [],
					warnings: [],
					error: 'Nothing changed, so no new revision was written.'
				});
		} catch (e) {
			return materialRefused(e, raw);
		}
		redirect(303, `/library/${event.params.materialId}`);
	}
};
