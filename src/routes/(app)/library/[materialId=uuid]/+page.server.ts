import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getMaterial, listElementsUsingMaterial, setMaterialStatus } from '$lib/server/library';
import { AppError } from '$lib/server/errors';

export const load = async (event) => {
	const member = requireMember(event);
	const material = await getMaterial(member.organisationId, event.params.materialId);
	if (!material) error(404, 'No such material in your library.');
	return {
		material,
		elements: await listElementsUsingMaterial(member.organisationId, event.params.materialId),
		canEdit: member.role === 'assessor' || member.role === 'admin',
		canVerify: member.role === 'supervisor' || member.role === 'admin'
	};
};

async function act(event: RequestEvent<{ materialId: string }>, action: 'verify' | 'supersede') {
	const member = requireRole(event, 'supervisor', 'admin');
	const fd = await event.request.formData();
	const expected = fd.get('revisionId');
	try {
		await setMaterialStatus(
			{ userId: member.user.id, organisationId: member.organisationId },
			event.params.materialId,
			action,
			typeof expected === 'string' && expected ? expected : undefined
		);
	} catch (e) {
		if (e instanceof AppError) return fail(e.status, { error: e.message });
		throw e;
	}
	return {
		done:
			action === 'verify'
				? 'Revision verified.'
				: 'Material superseded: it is no longer offered for new work.'
	};
}

export const actions = {
	verify: async function verify(event) {
		return act(event, 'verify');
	},
	supersede: async function supersede(event) {
		return act(event, 'supersede');
	}
};
