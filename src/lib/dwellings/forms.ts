/** Form schemas (plain strings, as a browser posts them) for the dwelling pages; the server module re-validates. */
import { z } from 'zod';
import { versionSchema } from '$lib/validation';
import { STAGES } from './schema';

export const dwellingFormSchema = z.object({
	reference: z
		.string()
		.trim()
		.min(1, 'Give the dwelling a reference, e.g. NF-014.')
		.max(60, 'At most 60 characters.'),
	address: z.string().trim().max(300, 'At most 300 characters.').default(''),
	programme: z.string().trim().max(120, 'At most 120 characters.').default(''),
	clientName: z.string().trim().max(160, 'At most 160 characters.').default(''),
	clientEmail: z
		.union([z.email('Enter an e-mail address such as name@example.test.'), z.literal('')])
		.default(''),
	assessorId: z.string().default(''),
	stage: z.enum(STAGES, { message: 'Choose design or as built.' }).default('design'),
	limitTableId: z.string().default(''),
	climateId: z.string().default(''),
	floorArea: z
		.string()
		.trim()
		.default('')
		.refine(
			(s) => s === '' || /^\d+([.,]\d+)?$/.test(s),
			'Enter the floor area in m², e.g. 86.5, or leave it empty.'
		)
		.refine(
			(s) => s === '' || (areaOf(s) > 0 && areaOf(s) <= 100000),
			'Enter a floor area above 0 and at most 100 000 m².'
		),
	version: z.number().int().default(0)
});
export type DwellingForm = z.infer<typeof dwellingFormSchema>;

/** A floor area as typed (a decimal comma allowed) as a number of m². */
const areaOf = (s: string) => Number(s.replace(',', '.'));

/** The form's fields as the dwelling service takes them: the floor area as a number, or null when empty. */
export function dwellingFieldsFromForm({ floorArea, ...rest }: Omit<DwellingForm, 'version'>) {
	return { ...rest, floorArea: floorArea === '' ? null : areaOf(floorArea) };
}

/** A stored floor area as the form shows it. */
export const floorAreaText = (v: number | null) => (v === null ? '' : String(v));

export const copyFormSchema = z.object({
	reference: z.string().trim().min(1, 'Give the copy its own reference.').max(60, 'At most 60 characters.'),
	address: z.string().trim().max(300, 'At most 300 characters.').default(''),
	/** "as-built" copies a design-stage dwelling as its as-built record */
	kind: z.enum(['copy', 'as-built']).default('copy')
});

export type CopyForm = z.infer<typeof copyFormSchema>;

/** Reopening an accepted dwelling (or one awaiting review): the reason, which the service judges, and the version. */
export const reopenFormSchema = z.object({ reason: z.string().default(''), version: versionSchema });
export type ReopenForm = z.infer<typeof reopenFormSchema>;

/** The dwelling page's buttons: archive or restore it. */
export const archiveFormSchema = z.object({ archived: z.enum(['true', 'false']), version: versionSchema });

/** The buttons of an element's row: duplicate it. */
export const elementButtonSchema = z.object({ elementId: z.uuid('is not an element of this dwelling') });

/** …delete it, checked against the version shown. */
export const deleteElementFormSchema = elementButtonSchema.extend({ version: versionSchema });

/** …move it a place up or down, checked against the dwelling's version. */
export const moveElementFormSchema = deleteElementFormSchema.extend({
	direction: z.enum(['up', 'down'], { message: 'must be up or down' })
});
