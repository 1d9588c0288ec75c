import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { checkSize, DEFAULT_MAX_BYTES } from '$lib/server/csv/read';
import { readUpload, type Upload } from '$lib/server/csv/upload';
import { errorResponse } from '$lib/server/http';
import { IMPORT_FIELDS, libraryImport, type ColumnMapping } from '$lib/server/library/import';

const paramsSchema = z.object({
	mode: z.enum(['preview', 'commit'], { error: 'mode must be preview or commit' }).default('preview'),
	token: z.string().max(200).optional(),
	confirmWarnings: z
		.enum(['yes', 'no', 'true', 'false'], { error: 'confirmWarnings must be yes or no' })
		.optional(),
	mapping: z
		.string()
		.max(64 * 1024)
		.optional()
});
const mappingSchema = z.record(z.string(), z.enum(IMPORT_FIELDS).nullable());

const bad = (message: string) => json({ message }, { status: 400 });

/**
 * Import a CSV file, read as it arrives. Either multipart/form-data with the fields first and the file
 * last (field `file`), or the file as the body with Content-Type: text/csv and the fields in the query
 * string. Fields: `mode` = preview (default; nothing is written) or commit (with the preview's `token`,
 * and `confirmWarnings` = yes when rows have warnings), and optionally `mapping` (JSON:
 * { fileHeader: field | null }). A commit whose preview the server still keeps does not read the file.
 */
export const POST = async (event) => {
	const member = requireRole(event, 'assessor', 'admin');
	const length = Number(event.request.headers.get('content-length') ?? 0);
	try {
		checkSize(Math.max(0, length - 64 * 1024), DEFAULT_MAX_BYTES);
	} catch (e) {
		return errorResponse(e);
	}
	let upload: Upload;
	try {
		upload = await readUpload(event.request, event.url);
	} catch (e) {
		return errorResponse(e);
	}
	try {
		return await handle(upload);
	} catch (e) {
		return errorResponse(e);
	} finally {
		await upload.finish();
	}

	/** Fields that came after the file, once the whole request has been read. */
	async function tooLate(upload: Upload): Promise<Response | null> {
		await upload.finish();
		const late = upload.lateFields().filter((f) => f in paramsSchema.shape);
		if (late.length === 0) return null;
		return bad(
			`The form field${late.length === 1 ? '' : 's'} ${late.join(', ')} came after the file and could not be used: put the fields before the file, or in the query string.`
		);
	}

	async function handle(upload: Upload): Promise<Response> {
		const params = paramsSchema.safeParse(Object.fromEntries(upload.fields));
		if (!params.success) return bad(params.error.issues.map((i) => i.message).join('; '));
		const { mode, token, confirmWarnings } = params.data;
		let mapping: ColumnMapping | null = null;
		if (params.data.mapping && params.data.mapping.trim() !== '') {
			let raw: unknown;
			try {
				raw = JSON.parse(params.data.mapping);
			} catch {
				raw = undefined;
			}
			const m = mappingSchema.safeParse(raw);
			if (!m.success) {
				return bad(
					`The column mapping must be JSON: { "file header": one of ${IMPORT_FIELDS.join(', ')}, or null }.`
				);
			}
			mapping = m.data;
		}
		const file = upload.file;
		if (mode === 'commit') {
			if (!token) {
				return (await tooLate(upload)) ?? bad('Preview the file first; the commit needs the preview token.');
			}
			// The file is read (when the preview is no longer kept) before the transaction begins.
			const plan = await libraryImport.plan(member.organisationId, file?.chunks ?? null, { mapping, token });
			const late = await tooLate(upload);
			if (late) return late;
			const summary = await libraryImport.commit(
				{ userId: member.user.id, organisationId: member.organisationId },
				plan,
				{ confirmWarnings: confirmWarnings === 'yes' || confirmWarnings === 'true', fileName: file?.name }
			);
			return json({ kind: 'summary', ...summary });
		}
		if (!file) return bad('Choose a CSV file to upload (field "file").');
		const preview = await libraryImport.preview(member.organisationId, file.chunks, { mapping });
		return (await tooLate(upload)) ?? json(preview);
	}
};
