import { error } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { getElementContext } from '$lib/server/dwellings/elements';
import { listEditorClimates } from '$lib/server/dwellings';
import { reopenAction } from '$lib/server/dwellings/reopen-action';
import { changeRefusal } from '$lib/dwellings/rules';
import { formFor } from '$lib/server/forms';
import { reopenFormSchema } from '$lib/dwellings/forms';
import { evidencePanel } from '$lib/server/evidence';

export const load = async (event) => {
	const member = requireMember(event);
	const ctx = await getElementContext(member.organisationId, event.params.elementId);
	if (!ctx || ctx.element.dwellingId !== event.params.dwellingId) error(404, 'No such element.');
	const writer = member.role !== 'supervisor';
	const needsReopening = changeRefusal(ctx.dwelling.status, ctx.dwelling.reopened)?.needsReason === true;
	const [climates, evidence, reopenForm] = await Promise.all([
		listEditorClimates(member.organisationId),
		evidencePanel(member, ctx.dwelling.id),
		formFor(reopenFormSchema, { reason: '', version: ctx.dwelling.version }, 'reopen')
	]);
	return {
		...ctx,
		climates,
		evidence,
		reopenForm,
		writer,
		needsReopening,
		canEdit: writer && !needsReopening
	};
};

export const actions = {
	/** Reopen the element's dwelling (accepted, or awaiting review) for changes, with a reason. */
	reopen: (event) => reopenAction(event, { reopened: true })
};
