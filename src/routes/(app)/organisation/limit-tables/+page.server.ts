import { fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createLimitTable, listLimitTables } from '$lib/server/limit-tables';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import { formErrors } from '$lib/validation';
import { limitTableFormValues, limitTableFromForm } from '$lib/limit-tables/form';
import { nameTaken } from '../../_name-taken';

export const load = async (event) => {
	const member = requireMember(event);
	return { tables: await listLimitTables(member.organisationId) };
};

export const actions = {
	create: async function create(event) {
		const member = requireRole(event, 'admin');
		const fd = await event.request.formData();
		const values = limitTableFormValues(fd);
		const input = limitTableInputSchema.safeParse(limitTableFromForm(fd));
		if (!input.success) return fail(400, { values, errors: formErrors(input.error) });
		let id: string;
		try {
			id = (await createLimitTable(member, input.data)).id;
		} catch (e) {
			return nameTaken(e, { values });
		}
		redirect(303, `/organisation/limit-tables/${id}?created=1`);
	}
};
