import { error, fail } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { getElementContext } from '$lib/server/dwellings/elements';
import { listEditorClimates, reopenDwelling, WRITE_ROLES } from '$lib/server/dwellings';
import { changeRefusal } from '$lib/dwellings/rules';
import { AppError } from '$lib/server/errors';
import { evidencePanel } from '$lib/server/evidence';
import { reopenRefusalText } from '$lib/dwellings/rules';

export const load = async (event) => {
	const member = requireMember(event);
	const ctx = await getElementContext(member.organisationId, event.params.elementId);
	if (!ctx || ctx.element.dwellingId !== event.params.dwellingId) error(404, 'No such element.');
	const writer = member.role !== 'supervisor';
	const needsReopening = changeRefusal(ctx.dwelling.status, ctx.dwelling.reopened)?.needsReason === true;
	const [climates, evidence] = await Promise.all([
		listEditorClimates(member.organisationId),
		evidencePanel(member, ctx.dwelling.id)
	]);
	return {
		...ctx,
		climates,
		evidence,
		writer,
		needsReopening,
		canEdit: writer && !needsReopening
	};
};

export const actions = {
	/** Reopen the element's dwelling (accepted, or awaiting review) for changes, with a reason. */
	reopen: async function reopen(event) {
		const member = requireRole(event, ...WRITE_ROLES);
		const data = await event.request.formData();
		try {
			await reopenDwelling(member, event.params.dwellingId, {
				reason: String(data.get('reason') ?? ''),
				version: Number(data.get('version'))
			});
		} catch (e) {
			if (e instanceof AppError && e.status < 500)
				return fail(e.status, { reopenError: reopenRefusalText(e.message, e.issues) });
			throw e;
		}
		return { reopened: true };
	}
};
