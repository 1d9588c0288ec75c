import { error, fail, type RequestEvent } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getMaterial, listElementsUsingMaterial, setMaterialStatus } from '$lib/server/library';
import {
	getReach,
	listMoves,
	reachElementIds,
	reachPage,
	reachReferences,
	startMove,
	type Reach
} from '$lib/server/library/reach';
import { MOVE_ROLES } from '$lib/server/library/reach-move';
import { refusalOf } from '$lib/server/errors';
import { invalidText, readForm, refuseAction } from '$lib/server/forms';
import { materialStatusFormSchema, moveFormSchema } from '$lib/library/forms';

/** Dwellings of the reach shown per page. */
const REACH_PAGE_SIZE = 25;
/** A link to a new audit batch carries the references in its address up to this length; beyond, a CSV. */
const AUDIT_LINK_MAX = 6000;

/** The address of a new audit batch of the reach's dwellings, or null when they are too many for one. */
function auditLink(reach: Reach): string | null {
	const references = reachReferences(reach);
	if (references.length === 0) return null;
	const name = `Correction of ${reach.material.code} (revision ${reach.to.revision})`;
	const href =
		`/audit/new?name=${encodeURIComponent(name)}` +
		`&references=${encodeURIComponent(references.join('\n'))}`;
	return href.length <= AUDIT_LINK_MAX ? href : null;
}

export const load = async (event) => {
	const member = requireMember(event);
	const material = await getMaterial(member.organisationId, event.params.materialId);
	if (!material) error(404, 'No such material in your library.');
	const [elements, reach, moves] = await Promise.all([
		listElementsUsingMaterial(member.organisationId, event.params.materialId),
		getReach(member.organisationId, event.params.materialId),
		listMoves(member.organisationId, event.params.materialId)
	]);
	const page = Number(event.url.searchParams.get('reachPage') ?? 1);
	const canAudit = member.role === 'supervisor' || member.role === 'admin';
	return {
		material,
		elements,
		reach: reach ? reachPage(reach, Number.isInteger(page) ? page : 1, REACH_PAGE_SIZE) : null,
		auditHref: canAudit && reach ? auditLink(reach) : null,
		moves,
		canEdit: member.role === 'assessor' || member.role === 'admin',
		canVerify: member.role === 'supervisor' || member.role === 'admin',
		canMove: MOVE_ROLES.includes(member.role),
		canAudit
	};
};

async function act(event: RequestEvent<{ materialId: string }>, action: 'verify' | 'supersede') {
	const member = requireRole(event, 'supervisor', 'admin');
	const form = await readForm(event.request, materialStatusFormSchema);
	if (!form.valid) return fail(400, { error: invalidText(form) });
	try {
		await setMaterialStatus(
			{ userId: member.user.id, organisationId: member.organisationId },
			event.params.materialId,
			action,
			form.data.revisionId
		);
	} catch (e) {
		return refuseAction(e, (refusal) => refusal.message);
	}
	return {
		done:
			action === 'verify'
				? 'Revision verified.'
				: 'Material superseded: it is no longer offered for new work.'
	};
}

/**
 * Move the ticked elements (or, with `scope=all`, every element of the reach) to the current revision:
 * each through the element service, skipped with the reason where the dwelling must be reopened first.
 */
async function move(event: RequestEvent<{ materialId: string }>) {
	const member = requireRole(event, ...MOVE_ROLES);
	const form = await readForm(event.request, moveFormSchema);
	if (!form.valid) return fail(400, { moveError: invalidText(form) });
	let elementIds = form.data.elementId;
	if (form.data.scope === 'all') {
		const reach = await getReach(member.organisationId, event.params.materialId);
		elementIds = reach ? reachElementIds(reach) : [];
	}
	if (elementIds.length === 0) {
		return fail(400, { moveError: 'Tick the elements to move first (or move all of them).' });
	}
	try {
		const out = await startMove(member, event.params.materialId, {
			elementIds,
			toRevisionId: form.data.toRevisionId
		});
		return { moved: out };
	} catch (e) {
		// shown beside the reach, where the move was asked for
		const refusal = refusalOf(e);
		if (!refusal) throw e;
		return fail(refusal.status, { moveError: refusal.message });
	}
}

export const actions = {
	verify: async function verify(event) {
		return act(event, 'verify');
	},
	supersede: async function supersede(event) {
		return act(event, 'supersede');
	},
	move
};
