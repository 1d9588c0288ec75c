import { fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createLimitTable, listLimitTables } from '$lib/server/limit-tables';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import { formErrors } from '$lib/validation';
import { limitTableFormValues, limitTableFromForm } from '$lib/limit-tables/form';
import { ConflictError } from '$lib/server/errors';

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
			if (e instanceof ConflictError) {
				return fail(409, { values, errors: { name: e.message } as Record<string, string> });
			}
			throw e;
		}
		redirect(303, `/organisation/limit-tables/${id}?created=1`);
	}
};
