import { error, fail } from '@sveltejs/kit';
import {
	checkHashAgainstCode,
	checkPdfAgainstCode,
	normaliseCode,
	sha256,
	verifyCode
} from '$lib/server/reports';

/** Largest PDF accepted for the comparison. */
const MAX_PDF_BYTES = 20 * 1024 * 1024;

export const load = async ({ params }) => {
	const report = await verifyCode(params.code);
	if (!report) error(404, 'No report was issued under this code. Check the code in the footer of the PDF.');
	return { report, code: normaliseCode(params.code) };
};

export const actions = {
	/** Compare a PDF (uploaded, or hashed in the browser so it never leaves the device) with the issued one. */
	check: async function check({ request, params }) {
		const data = await request.formData();
		const hashed = data.get('sha256');
		const file = data.get('pdf');
		if (typeof hashed === 'string' && hashed) {
			if (!/^[0-9a-f]{64}$/i.test(hashed))
				return fail(400, { error: 'The file could not be read. Choose the PDF again.' });
			const outcome = await checkHashAgainstCode(params.code, hashed);
			if (outcome === 'unknown') error(404, 'No report was issued under this code.');
			return {
				outcome,
				hash: hashed.toLowerCase(),
				name: String(data.get('name') ?? '')
			};
		}
		if (!(file instanceof File) || file.size === 0)
			return fail(400, { error: 'Choose the PDF file you received.' });
		if (file.size > MAX_PDF_BYTES)
			return fail(400, { error: 'The file is larger than 20 MB: it is not a report issued here.' });
		const bytes = new Uint8Array(await file.arrayBuffer());
		const outcome = await checkPdfAgainstCode(params.code, bytes);
		if (outcome === 'unknown') error(404, 'No report was issued under this code.');
		return { outcome, hash: sha256(bytes), name: file.name };
	}
};
