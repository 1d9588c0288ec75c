import { error, fail } from '@sveltejs/kit';
import { message, setError } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	decideItem,
	decisionRefusalFor,
	decisionStanding,
	getItem,
	listItems,
	type ItemRow
} from '$lib/server/audit';
import { checkDecision, decisionFormSchema } from '$lib/audit/forms';
import { DECISION_LABELS } from '$lib/audit/flags';
import { DECIDER_ROLES } from '$lib/audit/rules';
import { evidenceRequestFormSchema, EVIDENCE_REQUEST_FORM_ID } from '$lib/evidence/forms';
import { formFor, readForm, refuseForm } from '$lib/server/forms';
import { evidencePanel } from '$lib/server/evidence';

const weight = (i: ItemRow) =>
	i.flags.reduce((s, f) => s + (f.severity === 'high' ? 100 : f.severity === 'medium' ? 10 : 1), 0);

/**
 * The review queue: the most serious flags first, then by reference. The order does not depend on the
 * decisions, so an item keeps its place ("2 of 11") when it is decided and when the page is reloaded;
 * "next open" finds the next undecided one in the same order.
 */
function queueOrder(items: ItemRow[]) {
	return items.slice().sort((a, b) => weight(b) - weight(a) || a.reference.localeCompare(b.reference));
}

export async function load(event) {
	const member = requireMember(event);
	const item = await getItem(member.organisationId, event.params.itemId);
	if (!item || item.batchId !== event.params.batchId) error(404, 'No such audit item.');
	const queue = queueOrder(await listItems(member.organisationId, item.batchId));
	const at = queue.findIndex((q) => q.id === item.id);
	// The next undecided item after this one, wrapping round to the start.
	const open = (q: ItemRow) => q.state === 'awaiting-review' || q.state === 'resubmitted';
	const nextOpen = [...queue.slice(at + 1), ...queue.slice(0, Math.max(at, 0))].find(open);
	// Why this person may not decide here (they assessed the dwelling or issued its report), or null.
	const decisionRefusal = DECIDER_ROLES.includes(member.role)
		? await decisionRefusalFor(member.organisationId, item.dwellingId, member.user.id)
		: null;
	const [standing, evidence, decideForm, requestForm] = await Promise.all([
		decisionStanding(member.organisationId, item),
		evidencePanel(member, item.dwellingId),
		formFor(decisionFormSchema, { decision: '', comment: '' }, 'decide'),
		formFor(evidenceRequestFormSchema, { itemId: item.id, note: '', dueDate: '' }, EVIDENCE_REQUEST_FORM_ID)
	]);
	return {
		item,
		standing,
		evidence,
		decideForm,
		requestForm,
		decisionRefusal,
		position: at + 1,
		total: queue.length,
		previousId: at > 0 ? queue[at - 1].id : null,
		nextId: at >= 0 && at < queue.length - 1 ? queue[at + 1].id : null,
		nextOpenId: nextOpen?.id ?? null
	};
}

export const actions = {
	decide: async (event) => {
		const member = requireRole(event, ...DECIDER_ROLES);
		const form = await readForm(event.request, decisionFormSchema, 'decide');
		if (!form.valid) return fail(400, { decideForm: form });
		const checked = checkDecision(form.data);
		if (!checked.ok) {
			for (const i of checked.issues) setError(form, (i.field || '') as 'comment', i.message);
			return fail(400, { decideForm: form });
		}
		try {
			await decideItem(member, event.params.itemId, checked.input);
		} catch (e) {
			return refuseForm(form, e);
		}
		return message(form, `Recorded: ${DECISION_LABELS[checked.input.decision]}.`);
	}
};
