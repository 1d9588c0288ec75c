import { json } from '@sveltejs/kit';
import { requireRole } from '$lib/server/guard';
import { db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import { checkSize, DEFAULT_MAX_BYTES } from '$lib/server/csv/read';
import {
	commitMaterialsImport,
	IMPORT_FIELDS,
	previewMaterialsImport,
	type ColumnMapping
} from '$lib/server/csv/materials';
import { failure } from '../respond';

/**
 * Import a CSV file (multipart/form-data): `file`, `mode` = preview (default; nothing is written) or
 * commit (with the preview's `token`, and `confirmWarnings` = yes when rows have warnings), and
 * optionally `mapping` (JSON: { fileHeader: field | null }).
 */
export const POST = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const length = Number(event.request.headers.get('content-length') ?? 0);
	try {
		checkSize(Math.max(0, length - 64 * 1024), DEFAULT_MAX_BYTES);
	} catch (e) {
		return failure(e);
	}
	if (!(event.request.headers.get('content-type') ?? '').startsWith('multipart/form-data')) {
		return json({ message: 'Send the file as multipart/form-data, in a field named file.' }, { status: 400 });
	}
	let form: FormData;
	try {
		form = await event.request.formData();
	} catch {
		return json({ message: 'The upload could not be read; try again.' }, { status: 400 });
	}
	const file = form.get('file');
	if (!(file instanceof File))
		return json({ message: 'Choose a CSV file to upload (field "file").' }, { status: 400 });
	let mapping: ColumnMapping | null = null;
	const rawMapping = form.get('mapping');
	if (typeof rawMapping === 'string' && rawMapping.trim() !== '') {
		try {
			const m = JSON.parse(rawMapping);
			if (!m || typeof m !== 'object' || Array.isArray(m)) throw new Error();
			for (const v of Object.values(m))
				if (v !== null && !(IMPORT_FIELDS as readonly unknown[]).includes(v)) throw new Error();
			mapping = m;
		} catch {
			return json(
				{ message: 'The column mapping must be JSON: { "file header": "field" or null }.' },
				{ status: 400 }
			);
		}
	}
	try {
		const bytes = new Uint8Array(await file.arrayBuffer());
		if (form.get('mode') === 'commit') {
			const token = form.get('token');
			if (typeof token !== 'string' || token === '') {
				return json(
					{ message: 'Preview the file first; the commit needs the preview token.' },
					{ status: 400 }
				);
			}
			const confirm = form.get('confirmWarnings');
			const summary = await commitMaterialsImport(
				db,
				{ userId: member.user.id, organisationId: member.organisationId },
				bytes,
				{ mapping, token, confirmWarnings: confirm === 'yes' || confirm === 'true', fileName: file.name },
				(entry, trx) => logActivity(entry, trx)
			);
			return json({ kind: 'summary', ...summary });
		}
		return json(await previewMaterialsImport(db, member.organisationId, bytes, { mapping }));
	} catch (e) {
		return failure(e);
	}
};
