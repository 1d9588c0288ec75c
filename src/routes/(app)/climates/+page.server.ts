import { fail, redirect } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { createClimate, listClimates } from '$lib/server/climates';
import { parseClimateCsv } from '$lib/server/climates/import';
import { climateInputSchema } from '$lib/climates/schema';
import { climateFromForm, climateFormValues } from '$lib/climates/form';
import { formErrors } from '$lib/validation';
import { nameTaken } from '../_name-taken';

export const load = async (event) => {
	const member = requireMember(event);
	return { climates: await listClimates(member.organisationId) };
};

/** Saves the new climate and shows its page; a name already taken is refused with `form` kept. */
async function saveAndShow<T extends object>(
	member: Parameters<typeof createClimate>[0],
	input: Parameters<typeof createClimate>[1],
	form: T
) {
	let id: string;
	try {
		id = (await createClimate(member, input)).id;
	} catch (e) {
		return nameTaken(e, form);
	}
	redirect(303, `/climates/${id}?created=1`);
}

export const actions = {
	create: async function create(event) {
		const member = requireRole(event, 'admin');
		const fd = await event.request.formData();
		const values = climateFormValues(fd);
		const input = climateInputSchema.safeParse(climateFromForm(fd));
		if (!input.success) {
			return fail(400, { action: 'create' as const, values, errors: formErrors(input.error) });
		}
		return saveAndShow(member, input.data, { action: 'create' as const, values });
	},

	import: async function importCsv(event) {
		const member = requireRole(event, 'admin');
		const fd = await event.request.formData();
		const values = {
			name: String(fd.get('name') ?? ''),
			source: String(fd.get('source') ?? ''),
			illustrative: fd.get('illustrative') === 'on'
		};
		const file = fd.get('file');
		const pasted = String(fd.get('text') ?? '');
		let bytes: Uint8Array | string;
		let fileName = 'pasted text';
		if (file instanceof File && file.size > 0) {
			bytes = new Uint8Array(await file.arrayBuffer());
			fileName = file.name;
		} else if (pasted.trim() !== '') {
			bytes = pasted;
		} else {
			return fail(400, {
				action: 'import' as const,
				values,
				errors: { file: 'Choose a CSV file, or paste its text.' } as Record<string, string>,
				problems: []
			});
		}
		const parsed = parseClimateCsv(bytes);
		const input = climateInputSchema.safeParse({ ...values, months: parsed.ok ? parsed.months : [] });
		const errors = input.success ? {} : formErrors(input.error);
		delete errors.months;
		for (const k of Object.keys(errors)) if (k.startsWith('months.')) delete errors[k];
		if (!parsed.ok || !input.success || Object.keys(errors).length > 0) {
			return fail(400, {
				action: 'import' as const,
				values,
				errors,
				fileName,
				problems: parsed.ok ? [] : parsed.problems.map((p) => p.message)
			});
		}
		return saveAndShow(member, input.data, { action: 'import' as const, values, problems: [] });
	}
};
