import { requireRole } from '$lib/server/guard';
import { DEFAULT_MAX_BYTES } from '$lib/server/csv/read';
import { CSV_COLUMNS, IMPORT_FIELDS } from '$lib/server/library/import';

export const load = (event) => {
	requireRole(event, 'assessor', 'admin');
	return { maxBytes: DEFAULT_MAX_BYTES, columns: IMPORT_FIELDS.map((f) => CSV_COLUMNS[f]) };
};
