/**
 * The reopen form's action, which the dwelling page and the element editor share: an accepted dwelling, or
 * one awaiting review, is reopened with a reason before it changes.
 */
import type { RequestEvent } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { readForm, refuseForm } from '$lib/server/forms';
import { reopenFormSchema } from '$lib/dwellings/forms';
import { reopenRefusalText } from '$lib/dwellings/rules';
import { reopenDwelling, WRITE_ROLES } from './index';

/** Reopens the route's dwelling with the posted reason; `done` is added to the answer when it is reopened. */
export async function reopenAction(
	event: RequestEvent<{ dwellingId: string }>,
	done: Record<string, unknown>
) {
	const member = requireRole(event, ...WRITE_ROLES);
	const form = await readForm(event.request, reopenFormSchema, 'reopen');
	try {
		await reopenDwelling(member, event.params.dwellingId, form.data);
	} catch (e) {
		// every refusal is said in one line under the reason (a stale version as "reload the page")
		return refuseForm(form, e, {
			field: () => undefined,
			text: (r) => reopenRefusalText(r.message, r.issues)
		});
	}
	return { form, ...done };
}
