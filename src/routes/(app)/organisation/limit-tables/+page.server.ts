import { redirect } from '@sveltejs/kit';
import { fail, setError } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import { createLimitTable, listLimitTables } from '$lib/server/limit-tables';
import { formFor, readForm, refuseForm } from '$lib/server/forms';
import { ConflictError, ValidationError } from '$lib/server/errors';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import {
	blankLimitTableForm,
	limitTableFieldOf,
	limitTableFormSchema,
	limitTableInputFromForm
} from '$lib/limit-tables/forms';
import { fieldIssues } from '$lib/validation';

export const load = async (event) => {
	const member = requireMember(event);
	const [tables, limitTableForm] = await Promise.all([
		listLimitTables(member.organisationId),
		formFor(limitTableFormSchema, blankLimitTableForm())
	]);
	return { tables, limitTableForm };
};

export const actions = {
	create: async function create(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, limitTableFormSchema);
		if (!form.valid) return fail(400, { limitTableForm: form });
		const input = limitTableInputSchema.safeParse(limitTableInputFromForm(form.data));
		if (!input.success) {
			return refuseForm(form, new ValidationError(fieldIssues(input.error)), { field: limitTableFieldOf });
		}
		let id: string;
		try {
			id = (await createLimitTable(member, input.data)).id;
		} catch (e) {
			// the name and edition are taken: told beside the name, with what was typed kept
			if (e instanceof ConflictError) return setError(form, 'name', e.message, { status: 409 });
			return refuseForm(form, e, { field: limitTableFieldOf });
		}
		redirect(303, `/organisation/limit-tables/${id}?created=1`);
	}
};
