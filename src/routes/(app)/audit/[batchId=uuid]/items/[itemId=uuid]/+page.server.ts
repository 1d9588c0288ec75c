import { error, fail } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import {
	decideItem,
	decisionRefusalFor,
	decisionStanding,
	getItem,
	listItems,
	type ItemRow
} from '$lib/server/audit';
import { decisionSchema } from '$lib/audit/schemas';
import { DECIDER_ROLES } from '$lib/audit/rules';
import { AppError } from '$lib/server/errors';
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
	const [standing, evidence] = await Promise.all([
		decisionStanding(member.organisationId, item),
		evidencePanel(member, item.dwellingId)
	]);
	return {
		item,
		standing,
		evidence,
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
		const f = await event.request.formData();
		const raw = { decision: String(f.get('decision') ?? ''), comment: String(f.get('comment') ?? '') };
		const parsed = decisionSchema.safeParse(raw);
		if (!parsed.success) {
			const errors: Record<string, string> = {};
			for (const i of parsed.error.issues) errors[i.path.map(String).join('.')] ??= i.message;
			return fail(400, { values: raw, errors });
		}
		try {
			await decideItem(member, event.params.itemId, parsed.data);
		} catch (e) {
			if (e instanceof AppError)
				return fail(e.status, { values: raw, errors: { form: e.message } as Record<string, string> });
			throw e;
		}
		return { decided: parsed.data.decision };
	}
};
