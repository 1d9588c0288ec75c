/** A number a person typed into a form, as the domain's schemas take it (each domain's `forms.ts` uses it). */

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
