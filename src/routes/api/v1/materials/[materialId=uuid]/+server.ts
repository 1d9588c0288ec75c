import { error, json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getMaterial, updateMaterial } from '$lib/server/library';
import { failure, readJson } from '../respond';

/** One material: its current revision's values and every revision, newest first. */
export const GET = async (event) => {
	const member = requireMember(event);
	const m = await getMaterial(member.organisationId, event.params.materialId);
	if (!m) error(404, 'No such material.');
	return json(m);
};

/** Change the values: a new revision when anything differs. Body: values, confirmWarnings?, expectedRevisionId?. */
export const PUT = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const body = await readJson(event.request);
	if (!body.ok) return body.response;
	const { confirmWarnings, expectedRevisionId, ...values } = body.body;
	try {
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
	} catch (e) {
		return failure(e);
	}
};
