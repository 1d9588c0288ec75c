import { error, fail } from '@sveltejs/kit';
import { readForm } from '$lib/server/forms';
import { pdfCheckFormSchema, pdfCheckFromForm } from '$lib/reports/forms';
import {
	checkHashAgainstCode,
	checkPdfAgainstCode,
	normaliseCode,
	sha256,
	verifyCode
} from '$lib/server/reports';

export const load = async ({ params }) => {
	const report = await verifyCode(params.code);
	if (!report) error(404, 'No report was issued under this code. Check the code in the footer of the PDF.');
	return { report, code: normaliseCode(params.code) };
};

export const actions = {
	/** Compare a PDF (uploaded, or hashed in the browser so it never leaves the device) with the issued one. */
	check: async function check({ request, params }) {
		const form = await readForm(request, pdfCheckFormSchema);
		const read = form.valid ? pdfCheckFromForm(form.data) : { error: 'Choose the PDF file you received.' };
		if ('error' in read) return fail(400, { error: read.error });
		if ('hash' in read) {
			const outcome = await checkHashAgainstCode(params.code, read.hash);
			if (outcome === 'unknown') error(404, 'No report was issued under this code.');
			return { outcome, hash: read.hash, name: read.name };
		}
		const bytes = new Uint8Array(await read.file.arrayBuffer());
		const outcome = await checkPdfAgainstCode(params.code, bytes);
		if (outcome === 'unknown') error(404, 'No report was issued under this code.');
		return { outcome, hash: sha256(bytes), name: read.file.name };
	}
};
