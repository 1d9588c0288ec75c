import { fail, redirect } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { createMaterial, valuesFromForm } from '$lib/server/library';
import { AppError, type FieldIssue } from '$lib/server/errors';

/** Issues keyed by the library's field names, as the material form shows them. */
const byField = (issues: FieldIssue[]) => issues.map((i) => ({ field: i.path, message: i.message }));

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
			if (e instanceof AppError)
				return fail(e.status, {
					values: raw,
					issues: byField(e.issues),
					warnings: byField(e.warnings),
					error: e.message
				});
			throw e;
		}
		redirect(303, `/library/${id}`);
	}
};
