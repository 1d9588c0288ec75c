/** Reading the plain HTML forms of the climate and limit-table pages into the shared schemas' input. */
import type { z } from 'zod';
import { LIMIT_KINDS } from './schema';

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

const text = (v: FormDataEntryValue | null) => (typeof v === 'string' ? v : '');

/** The climate form: name, source, illustrative, and 12 × temperature / relativeHumidity in calendar order. */
export function climateFromForm(fd: FormData) {
	const t = fd.getAll('temperature');
	const rh = fd.getAll('relativeHumidity');
	return {
		name: text(fd.get('name')),
		source: text(fd.get('source')),
		illustrative: fd.get('illustrative') === 'on' || fd.get('illustrative') === 'true',
		months: Array.from({ length: 12 }, (_, i) => ({
			month: i + 1,
			temperature: formNumber(t[i]),
			relativeHumidity: formNumber(rh[i])
		}))
	};
}

/** What the user typed, to put back into the form after a refusal. */
export function climateFormValues(fd: FormData) {
	return {
		name: text(fd.get('name')),
		source: text(fd.get('source')),
		illustrative: fd.get('illustrative') === 'on',
		temperature: fd.getAll('temperature').map((v) => text(v)),
		relativeHumidity: fd.getAll('relativeHumidity').map((v) => text(v))
	};
}

/** The limit-table form: name, edition, dated, source, isDefault, and `limit.<kind>` per element kind. */
export function limitTableFromForm(fd: FormData) {
	const limits: Record<string, number | string> = {};
	for (const kind of LIMIT_KINDS) {
		const v = formNumber(fd.get(`limit.${kind}`));
		if (v !== undefined) limits[kind] = v;
	}
	const dated = text(fd.get('dated')).trim();
	return {
		name: text(fd.get('name')),
		edition: text(fd.get('edition')),
		dated: dated === '' ? null : dated,
		source: text(fd.get('source')),
		isDefault: fd.get('isDefault') === 'on',
		limits
	};
}

export function limitTableFormValues(fd: FormData) {
	const limits: Record<string, string> = {};
	for (const kind of LIMIT_KINDS) limits[kind] = text(fd.get(`limit.${kind}`));
	return {
		name: text(fd.get('name')),
		edition: text(fd.get('edition')),
		dated: text(fd.get('dated')),
		source: text(fd.get('source')),
		isDefault: fd.get('isDefault') === 'on',
		limits
	};
}

/**
 * zod issues as one message per form field, keyed by path (`months.3.temperature`, `limits.flat-roof`);
 * a message for the whole of an array or object is kept under its own path (`months`, `limits`).
 */
export function formErrors(error: z.ZodError): Record<string, string> {
	const out: Record<string, string> = {};
	for (const i of error.issues) {
		const key = i.path.map(String).join('.') || '_';
		out[key] ??= i.message;
	}
	return out;
}
