/**
 * zod schemas for climates, limit tables and templates, shared by the pages, the JSON API, the CSV
 * import and the server modules. Messages read on their own ("must be 0–100 %") and after a field path.
 */
import { z } from 'zod';
import { climateMonthSchema, layerSchema } from '$lib/physics';
import { ELEMENT_KINDS, GIVEN_U_KINDS, type ElementKind } from '$lib/dwellings/kinds';

const text = (label: string, max: number) =>
	z
		.string({ error: `${label} must be text` })
		.trim()
		.min(1, `${label} is required`)
		.max(max, `${label} must be at most ${max} characters`);

const optionalText = (label: string, max: number) =>
	z
		.string({ error: `${label} must be text` })
		.trim()
		.max(max, `${label} must be at most ${max} characters`)
		.nullish()
		.transform((v) => (v ? v : null));

/* ------------------------------------------------------------------ climates */

export const MONTH_NAMES = [
	'January',
	'February',
	'March',
	'April',
	'May',
	'June',
	'July',
	'August',
	'September',
	'October',
	'November',
	'December'
] as const;

/** Twelve months, each of 1–12 exactly once, returned in calendar order. */
export const climateMonthsSchema = z
	.array(climateMonthSchema, { error: 'must be a list of 12 months' })
	.superRefine((months, ctx) => {
		const seen = new Map<number, number>();
		months.forEach((m, i) => {
			const first = seen.get(m.month);
			if (first !== undefined) {
				ctx.addIssue({
					code: 'custom',
					path: [i, 'month'],
					message: `month ${m.month} appears twice`
				});
			} else seen.set(m.month, i);
		});
		if (months.length !== 12) {
			ctx.addIssue({
				code: 'custom',
				path: [],
				message: `${months.length} month${months.length === 1 ? '' : 's'} given, 12 needed`
			});
		}
	})
	.transform((months) => [...months].sort((a, b) => a.month - b.month));

export const climateInputSchema = z.object({
	name: text('name', 120),
	source: text('source', 500),
	illustrative: z.boolean({ error: 'illustrative must be true or false' }).default(false),
	months: climateMonthsSchema
});
export type ClimateInput = z.input<typeof climateInputSchema>;

/* ------------------------------------------------------------------ limit tables */

/** The kinds a limit table may name (all of them, windows and doors included). */
export const LIMIT_KINDS: readonly ElementKind[] = ELEMENT_KINDS;

const maxU = z
	.number({ error: 'must be a number in W/(m²·K)' })
	.gt(0, 'must be greater than 0 W/(m²·K)')
	.lte(10, 'must be at most 10 W/(m²·K)');

export const limitValuesSchema = z
	.partialRecord(z.enum(ELEMENT_KINDS, { error: 'is not an element kind' }), maxU, {
		error: 'must be an object of element kind → maximum U'
	})
	.refine((v) => Object.values(v).some((x) => x !== undefined), {
		message: 'give a maximum U for at least one element kind'
	});

export const limitTableInputSchema = z.object({
	name: text('name', 120),
	edition: text('edition', 60),
	dated: z.iso
		.date({ error: 'dated must be a date written YYYY-MM-DD' })
		.nullish()
		.transform((v) => v ?? null),
	source: optionalText('source', 500),
	isDefault: z.boolean({ error: 'isDefault must be true or false' }).optional(),
	limits: limitValuesSchema
});
export type LimitTableInput = z.input<typeof limitTableInputSchema>;

/* ------------------------------------------------------------------ templates */

/** Kinds that have a build-up (windows and doors take a given U-value instead). */
export const TEMPLATE_KINDS = ELEMENT_KINDS.filter((k) => !GIVEN_U_KINDS.includes(k)) as [
	ElementKind,
	...ElementKind[]
];

/** A layer as stored in a build-up: the engine's layer plus where it came from in the library. */
export const storedLayerSchema = layerSchema.safeExtend({
	materialId: z.uuid('materialId must be an id').optional(),
	materialRevisionId: z.uuid('materialRevisionId must be an id').optional(),
	materialCode: z.string().max(60, 'materialCode must be at most 60 characters').optional(),
	bridgeGeometry: z
		.object({
			widthMm: z.number().gt(0, 'must be > 0 mm'),
			centresMm: z.number().gt(0, 'must be > 0 mm')
		})
		.optional()
});

export const buildUpSchema = z.object({
	rsi: z.number().gte(0, 'must be ≥ 0 m²·K/W').lte(10, 'must be ≤ 10 m²·K/W').optional(),
	rse: z.number().gte(0, 'must be ≥ 0 m²·K/W').lte(10, 'must be ≤ 10 m²·K/W').optional(),
	layers: z
		.array(storedLayerSchema, { error: 'must be a list of layers' })
		.min(1, 'at least one layer is required')
		.max(40, 'at most 40 layers')
});
export type BuildUp = z.infer<typeof buildUpSchema>;
export type StoredLayer = z.infer<typeof storedLayerSchema>;

export const templateInputSchema = z.object({
	name: text('name', 120),
	kind: z.enum(TEMPLATE_KINDS, {
		error: 'kind must be an element kind with a build-up (not a window or door)'
	}),
	description: optionalText('description', 2000),
	buildUp: buildUpSchema
});
export type TemplateInput = z.input<typeof templateInputSchema>;

/** A partial update of a template: any of its fields. */
export const templatePatchSchema = templateInputSchema.partial();

/* ------------------------------------------------------------------ helpers */

export type FieldIssue = { path: string; message: string };

/** zod issues as `{ path: 'months.3.relativeHumidity', message }`. */
export function fieldIssues(error: z.ZodError): FieldIssue[] {
	return error.issues.map((i) => ({
		path: i.path.map(String).join('.') || '(input)',
		message: i.message
	}));
}
