/** Reading the plain HTML form of the limit-table pages into the shared schema's input. */
import { formNumber, formText as text } from '$lib/forms';
import { LIMIT_KINDS } from './schema';

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

/** The limit-table edit form: its fields, and the version the page loaded (a hidden field). */
export function limitTableUpdateFromForm(fd: FormData) {
	return { ...limitTableFromForm(fd), version: formNumber(fd.get('version')) };
}

/** What the user typed, to put back into the form after a refusal. */
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
