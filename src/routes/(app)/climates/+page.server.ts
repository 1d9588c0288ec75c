import { redirect } from '@sveltejs/kit';
import { fail, setError, type SuperValidated } from 'sveltekit-superforms';
import { requireMember, requireRole } from '$lib/server/guard';
import { createClimate, listClimates } from '$lib/server/climates';
import { parseClimateCsv } from '$lib/server/climates/import';
import { formFor, readForm, refuseForm } from '$lib/server/forms';
import { ConflictError, ValidationError } from '$lib/server/errors';
import { climateInputSchema, type ClimateInput } from '$lib/climates/schema';
import {
	blankClimateForm,
	blankClimateImportForm,
	climateFieldOf,
	climateFormSchema,
	climateImportFieldOf,
	climateImportFormSchema,
	climateInputFromForm
} from '$lib/climates/forms';
import { fieldIssues } from '$lib/validation';

export const load = async (event) => {
	const member = requireMember(event);
	const [climates, createForm, importForm] = await Promise.all([
		listClimates(member.organisationId),
		formFor(climateFormSchema, blankClimateForm(), 'create'),
		formFor(climateImportFormSchema, blankClimateImportForm(), 'import')
	]);
	return { climates, createForm, importForm };
};

/**
 * Saves the new climate and shows its page; a name already taken is refused beside the form's name
 * (409), with what was typed kept.
 */
async function saveAndShow<T extends { name: string }>(
	member: Parameters<typeof createClimate>[0],
	input: ClimateInput,
	form: SuperValidated<T>
) {
	let id: string;
	try {
		id = (await createClimate(member, input)).id;
	} catch (e) {
		if (e instanceof ConflictError) return setError(form, 'name' as never, e.message, { status: 409 });
		return refuseForm(form, e);
	}
	redirect(303, `/climates/${id}?created=1`);
}

export const actions = {
	create: async function create(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, climateFormSchema, 'create');
		if (!form.valid) return fail(400, { createForm: form });
		const input = climateInputSchema.safeParse(climateInputFromForm(form.data));
		if (!input.success) {
			return refuseForm(form, new ValidationError(fieldIssues(input.error)), { field: climateFieldOf });
		}
		return saveAndShow(member, input.data, form);
	},

	import: async function importCsv(event) {
		const member = requireRole(event, 'admin');
		const form = await readForm(event.request, climateImportFormSchema, 'import');
		if (!form.valid) return fail(400, { importForm: form, problems: [] as string[] });
		const { file, text, ...fields } = form.data;
		let bytes: Uint8Array | string;
		let fileName = 'pasted text';
		if (file && file.size > 0) {
			bytes = new Uint8Array(await file.arrayBuffer());
			fileName = file.name;
		} else if (text.trim() !== '') {
			bytes = text;
		} else {
			setError(form, 'file', 'Choose a CSV file, or paste its text.');
			return fail(400, { importForm: form, problems: [] as string[] });
		}
		const parsed = parseClimateCsv(bytes);
		const input = climateInputSchema.safeParse({ ...fields, months: parsed.ok ? parsed.months : [] });
		// The months' problems are the file's, told by line below; the form keeps its own fields' problems.
		const issues = input.success
			? []
			: fieldIssues(input.error).filter((i) => i.path !== 'months' && !i.path.startsWith('months.'));
		for (const issue of issues) setError(form, (climateImportFieldOf(issue.path) ?? '') as '', issue.message);
		if (!parsed.ok || !input.success || issues.length > 0) {
			return fail(400, {
				importForm: form,
				fileName,
				problems: parsed.ok ? [] : parsed.problems.map((p) => p.message)
			});
		}
		return saveAndShow(member, input.data, form);
	}
};
