import { fail } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { invalidText, readForm } from '$lib/server/forms';
import { reachCodes, reachCodesFormSchema } from '$lib/library/forms';
import { DEFAULT_MAX_BYTES } from '$lib/server/csv/read';
import { CSV_COLUMNS, IMPORT_FIELDS } from '$lib/server/library/import';
import { reachOfCodes } from '$lib/server/library/reach';

export const load = (event) => {
	requireRole(event, 'assessor', 'admin');
	return { maxBytes: DEFAULT_MAX_BYTES, columns: IMPORT_FIELDS.map((f) => CSV_COLUMNS[f]) };
};

export const actions = {
	/**
	 * After a commit: for each code that got a new revision, how many elements and dwellings still use
	 * an older revision of it.
	 */
	reach: async function reach(event) {
		const member = requireRole(event, 'assessor', 'admin');
		const form = await readForm(event.request, reachCodesFormSchema);
		if (!form.valid) return fail(400, { error: invalidText(form) });
		return { reach: await reachOfCodes(member.organisationId, reachCodes(form.data.code)) };
	}
};
