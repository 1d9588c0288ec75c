/**
 * The library's form schemas (flat, as a browser posts them) and their reading into the library's input.
 * The material form's numbers stay text here (a decimal comma must keep working); `materialInputFromForm`
 * turns them into the values that `materialValuesSchema`, the schema the JSON API uses too, then judges.
 */
import { z } from 'zod';
import { formNumber } from '$lib/forms';
import { NUMBER_FIELDS, type MaterialValues } from './schema';

const text = () => z.string().default('');

/** The material form (new and revised): every value as typed, the two check boxes, the revision it was opened on. */
export const materialFormSchema = z.object({
	code: text(),
	name: text(),
	manufacturer: text(),
	category: text(),
	lambdaKind: text(),
	lambda: text(),
	resistance: text(),
	muDry: text(),
	muWet: text(),
	sd: text(),
	density: text(),
	specificHeat: text(),
	thicknessMinMm: text(),
	thicknessMaxMm: text(),
	source: text(),
	sourceIssued: text(),
	sourceExpires: text(),
	notes: text(),
	indicative: z.boolean().default(false),
	/** "the values are right: save them anyway", offered once the library has warned */
	confirmWarnings: z.boolean().default(false),
	/** the revision the change form was opened on (absent on the new-material form) */
	expectedRevisionId: z.uuid('is not a revision of this material').optional()
});
export type MaterialForm = z.infer<typeof materialFormSchema>;

/** The material form's fields that carry a value of the material (its name is its field in the library). */
export type MaterialFormField = Exclude<keyof MaterialForm, 'confirmWarnings' | 'expectedRevisionId'>;

/** A number written with digits grouped by spaces ("1 200", "1 200,5"), as the CSV import reads it too. */
const GROUPED = /^[+-]?\d{1,3}([ \u00a0]\d{3})+([.,]\d+)?$/;
const ungrouped = (s: string) => (GROUPED.test(s.trim()) ? s.replace(/[ \u00a0]/g, '') : s);

/**
 * The material form as the library's input (`MaterialValuesInput`): text trimmed, a blank optional field
 * null, a blank manufacturer "generic", numbers read with a point or a comma (a blank one null; text that
 * is not a number is passed on as it is, so the schema says which field and why).
 */
export function materialInputFromForm(f: MaterialForm): Record<string, unknown> {
	const orNull = (s: string) => s.trim() || null;
	const input: Record<string, unknown> = {
		code: f.code.trim(),
		name: f.name.trim(),
		manufacturer: f.manufacturer.trim() || 'generic',
		category: f.category.trim(),
		lambdaKind: orNull(f.lambdaKind),
		source: orNull(f.source),
		sourceIssued: orNull(f.sourceIssued),
		sourceExpires: orNull(f.sourceExpires),
		notes: orNull(f.notes),
		indicative: f.indicative
	};
	for (const k of NUMBER_FIELDS) input[k] = formNumber(ungrouped(f[k])) ?? null;
	return input;
}

/** A material's values as the form shows them (a number as its text, nothing as blank). */
export function materialFormValues(v: Partial<MaterialValues>): MaterialForm {
	const shown = (x: unknown) => (x === null || x === undefined ? '' : String(x));
	const out = {
		code: shown(v.code),
		name: shown(v.name),
		manufacturer: shown(v.manufacturer ?? 'generic'),
		category: shown(v.category),
		lambdaKind: shown(v.lambdaKind),
		source: shown(v.source),
		sourceIssued: shown(v.sourceIssued),
		sourceExpires: shown(v.sourceExpires),
		notes: shown(v.notes),
		indicative: Boolean(v.indicative),
		confirmWarnings: false
	} as MaterialForm;
	for (const k of NUMBER_FIELDS) out[k] = shown(v[k]);
	return out;
}

const MATERIAL_FIELDS = new Set<string>(Object.keys(materialFormSchema.shape));

/**
 * A library issue's path as the material form's field (the form names its fields as the library does);
 * undefined for a path the form has no field for (a whole-row issue), which the form shows above itself.
 */
export const materialFieldOf = (path: string): MaterialFormField | undefined =>
	MATERIAL_FIELDS.has(path) && path !== 'confirmWarnings' && path !== 'expectedRevisionId'
		? (path as MaterialFormField)
		: undefined;

/** Verify or supersede: the revision the page showed (refused when a newer one was written meanwhile). */
export const materialStatusFormSchema = z.object({
	revisionId: z.uuid('is not a revision of this material')
});

/**
 * Move elements to the current revision: the ticked elements' ids, or `scope=all` for every element of
 * the reach; the revision to move to. The element ids are judged by the move's own schema.
 */
export const moveFormSchema = z.object({
	elementId: z.array(z.string()).default([]),
	scope: z.enum(['all']).optional(),
	toRevisionId: z.uuid('is not the id of a revision of this material')
});

/** After an import: the codes that got a new revision (their reach is asked for). */
export const reachCodesFormSchema = z.object({
	code: z.array(z.string()).default([])
});

/** The codes worth asking about: not blank, not longer than a code can be. */
export const reachCodes = (codes: readonly string[]) => codes.filter((c) => c.length > 0 && c.length <= 200);
