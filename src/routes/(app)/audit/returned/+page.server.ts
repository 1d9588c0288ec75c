import { fail } from '@sveltejs/kit';
import { message, setError } from 'sveltekit-superforms';
import { requireMember } from '$lib/server/guard';
import { listReturned, resubmitItem } from '$lib/server/audit';
import { checkResubmit, resubmitFormId, resubmitFormSchema } from '$lib/audit/forms';
import { formFor, readForm, refuseForm } from '$lib/server/forms';

export async function load(event) {
	const member = requireMember(event);
	const items = await listReturned(member);
	return {
		items: await Promise.all(
			items.map(async (i) => ({
				...i,
				resubmitForm: await formFor(resubmitFormSchema, { itemId: i.id, comment: '' }, resubmitFormId(i.id))
			}))
		)
	};
}

export const actions = {
	/** One returned item's form (each has its own id, posted with it). */
	resubmit: async (event) => {
		const member = requireMember(event);
		const form = await readForm(event.request, resubmitFormSchema);
		if (form.errors.itemId) {
			setError(form, '', 'No such audit item.');
			return fail(400, { resubmitForm: form });
		}
		const checked = checkResubmit(form.data);
		if (!checked.ok) {
			for (const i of checked.issues) setError(form, (i.field || '') as 'comment', i.message);
			return fail(400, { resubmitForm: form });
		}
		let reference: string;
		try {
			({ reference } = await resubmitItem(member, form.data.itemId, checked.input));
		} catch (e) {
			// "issue the dwelling report again…": the refusal's own sentence, its issues name no field here
			return refuseForm(form, e, { text: (r) => r.message });
		}
		return message(form, `${reference} is back with the supervisor for review.`);
	}
};
