/**
 * The climate pages' forms, as a browser posts them (text, repeated fields as arrays of text), and their
 * reading into the shared schema's input (`climateInputSchema`, the one the JSON API uses).
 */
import { z } from 'zod';
import { formNumber } from '$lib/forms';
import { versionSchema } from '$lib/validation';

/** The months of a climate, in calendar order. */
const MONTHS = 12;

/** A climate by hand: name, source, illustrative, and 12 × temperature / relative humidity, January first. */
export const climateFormSchema = z.object({
	name: z.string(),
	source: z.string(),
	illustrative: z.boolean(),
	temperature: z.array(z.string()),
	relativeHumidity: z.array(z.string())
});
export type ClimateForm = z.infer<typeof climateFormSchema>;

/** The edit form: the same fields, and the version the page loaded (a hidden field). */
export const climateEditFormSchema = climateFormSchema.extend({ version: versionSchema });
export type ClimateEditForm = z.infer<typeof climateEditFormSchema>;

/** A climate from CSV: its name, source and flag, and a file or its pasted text. */
export const climateImportFormSchema = z.object({
	name: z.string(),
	source: z.string(),
	illustrative: z.boolean(),
	file: z.instanceof(File, { error: 'must be a CSV file' }).optional(),
	text: z.string()
});
export type ClimateImportForm = z.infer<typeof climateImportFormSchema>;

/** The delete button: the version shown. */
export const climateDeleteFormSchema = z.object({ version: versionSchema });

/** The empty form of a new climate. */
export const blankClimateForm = (): ClimateForm => ({
	name: '',
	source: '',
	illustrative: false,
	temperature: Array.from({ length: MONTHS }, () => ''),
	relativeHumidity: Array.from({ length: MONTHS }, () => '')
});

/** The empty import form. */
export const blankClimateImportForm = (): ClimateImportForm => ({
	name: '',
	source: '',
	illustrative: false,
	text: ''
});

type StoredClimate = {
	name: string;
	source: string;
	illustrative: boolean;
	version: number;
	months: readonly { month: number; temperature: number; relativeHumidity: number }[];
};

/** A stored climate as its edit form starts. */
export function climateFormOf(c: StoredClimate): ClimateEditForm {
	const months = [...c.months].sort((a, b) => a.month - b.month);
	return {
		name: c.name,
		source: c.source,
		illustrative: c.illustrative,
		temperature: months.map((m) => String(m.temperature)),
		relativeHumidity: months.map((m) => String(m.relativeHumidity)),
		version: c.version
	};
}

/**
 * The form's values as the climate's input: each typed number read (a decimal comma too; a blank is
 * left out, text is kept for the schema to name), month 1–12 from its position.
 */
export function climateInputFromForm(f: ClimateForm) {
	return {
		name: f.name,
		source: f.source,
		illustrative: f.illustrative,
		months: Array.from({ length: MONTHS }, (_, i) => ({
			month: i + 1,
			temperature: formNumber(f.temperature[i]),
			relativeHumidity: formNumber(f.relativeHumidity[i])
		}))
	};
}

/** The edit form's values as the climate's replacement (`climateUpdateSchema`'s input). */
export function climateUpdateFromForm(f: ClimateEditForm) {
	return { ...climateInputFromForm(f), version: f.version };
}

/**
 * The form field a path of the climate's schema names (`months.3.temperature` → `temperature[3]`), or
 * undefined for a path no single field holds (it is shown as the form's message).
 */
export function climateFieldOf(path: string): string | undefined {
	if (path === 'name' || path === 'source' || path === 'illustrative' || path === 'version') return path;
	const month = /^months\.(\d+)\.(temperature|relativeHumidity)$/.exec(path);
	return month && Number(month[1]) < MONTHS ? `${month[2]}[${month[1]}]` : undefined;
}

/** The import form's field a path names: only its own fields (the months are the file's, by line). */
export function climateImportFieldOf(path: string): string | undefined {
	return path === 'name' || path === 'source' || path === 'illustrative' ? path : undefined;
}
