/** Reading plain HTML form values into the shared schemas' input (used by the form actions). */

/** A form value as a number, or the raw text (so the schema says what is wrong with it), or undefined when blank. */
export function formNumber(v: FormDataEntryValue | null | undefined): number | string | undefined {
	if (v === null || v === undefined || typeof v !== 'string') return undefined;
	const s = v
		.trim()
		.replace(/^\u2212/, '-')
		.replace(',', '.');
	if (s === '') return undefined;
	const n = Number(s);
	return Number.isFinite(n) && /^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(s) ? n : v.trim();
}

/** A form value as text; '' when absent or a file. */
export const formText = (v: FormDataEntryValue | null) => (typeof v === 'string' ? v : '');
