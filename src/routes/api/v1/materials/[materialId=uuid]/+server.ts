import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getMaterial, updateMaterial } from '$lib/server/library';
import { answer, readJsonObject } from '$lib/server/http';

/** One material: its current revision's values and every revision, newest first. */
export const GET = async (event) => {
	const member = requireMember(event);
	const m = await getMaterial(member.organisationId, event.params.materialId);
	if (!m) error(404, 'No such material.');
	return json(m);
};

/** Change the values: a new revision when anything differs. Body: values, confirmWarnings?, expectedRevisionId?. */
export const PUT = (event) =>
	answer(async () => {
		const member = requireRole(event, 'assessor', 'admin');
		const { confirmWarnings, expectedRevisionId, ...values } = await readJsonObject(event.request);
		const r = await updateMaterial(
			{ userId: member.user.id, organisationId: member.organisationId },
			event.params.materialId,
			values,
			{
				confirmWarnings: confirmWarnings === true,
				expectedRevisionId: typeof expectedRevisionId === 'string' ? expectedRevisionId : undefined
			}
		);
		return json(r);
	});
