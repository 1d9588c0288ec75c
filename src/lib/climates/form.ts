/** Reading the plain HTML form of the climate pages into the shared schema's input. */
import { formNumber, formText as text } from '$lib/forms';

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

/** The climate edit form: its fields, and the version the page loaded (a hidden field). */
export function climateUpdateFromForm(fd: FormData) {
	return { ...climateFromForm(fd), version: formNumber(fd.get('version')) };
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
