import { error, fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { getCurrentRevision, updateMaterial, valuesFromForm } from '$lib/server/library';
import { AppError, type FieldIssue } from '$lib/server/errors';

/** Issues keyed by the library's field names, as the material form shows them. */
const byField = (issues: FieldIssue[]) => issues.map((i) => ({ field: i.path, message: i.message }));

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
			if (e instanceof AppError)
				return fail(e.status, {
					values: raw,
					issues: byField(e.issues),
					warnings: byField(e.warnings),
					error: e.message
				});
			throw e;
		}
		redirect(303, `/library/${event.params.materialId}`);
	}
};
