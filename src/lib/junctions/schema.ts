/**
 * zod schemas of junctions, shared by the pages, the JSON API, the service and the OpenAPI document.
 * A junction is either calculated (a two-dimensional model, built from the dwelling's elements or
 * entered as rectangles) or has a ψ-value entered from another source, which is then named.
 * The model itself (the engine's `JunctionInput`) is checked by the engine's own
 * `parseJunctionInput`, with its paths under `model.`.
 */
import { z } from 'zod';
import { DIMENSION_SYSTEMS, JUNCTION_TYPES, PSI_SOURCES } from './kinds';
import { versionSchema } from '$lib/validation';

export { versionSchema };

const number = (what: string) =>
	z.number({
		error: (iss) => (iss.input === undefined ? `is required: ${what}` : `must be a number: ${what}`)
	});
const between = (what: string, min: number, max: number, unit: string) =>
	number(what).gte(min, `must be ≥ ${min} ${unit}`).lte(max, `must be ≤ ${max} ${unit}`);
const lambda = () =>
	number('λ in W/(m·K)')
		.gt(0, 'must be > 0 W/(m·K)')
		.gte(0.001, 'must be ≥ 0.001 W/(m·K)')
		.lte(1000, 'must be ≤ 1000 W/(m·K)');
const text = (max: number) =>
	z.string({ error: 'must be text' }).trim().max(max, `must be at most ${max} characters`);

export const junctionTypeSchema = z.enum(JUNCTION_TYPES, {
	error: `must be one of ${JUNCTION_TYPES.join(', ')}`
});
export const dimensionSystemSchema = z.enum(DIMENSION_SYSTEMS, {
	error: 'must be internal, overall-internal or external'
});

/** Inside conditions for the surface check: temperature, and a humidity class or a relative humidity. */
export const junctionInternalSchema = z
	.object({
		temperature: between('inside temperature in °C', 5, 35, '°C'),
		humidityClass: z.literal([1, 2, 3, 4, 5], { error: 'must be 1, 2, 3, 4 or 5' }).optional(),
		relativeHumidity: number('relative humidity in %')
			.gt(0, 'must be > 0 %')
			.lte(100, 'must be ≤ 100 %')
			.optional()
	})
	.refine((v) => !(v.humidityClass !== undefined && v.relativeHumidity !== undefined), {
		message: 'give a humidity class or a relative humidity, not both',
		path: ['relativeHumidity']
	});

/** A rectangle of another material in the first element, placed in that element's own frame (see the builder). */
export const junctionInsertSchema = z
	.object({
		name: text(60).default('Insert'),
		lambda: lambda(),
		/** along the element from the junction plane, mm (negative: the other way) */
		alongFromMm: between('start along the element in mm', -5000, 5000, 'mm').default(0),
		lengthMm: between('length along the element in mm', 0, 5000, 'mm').gt(0, 'must be > 0 mm'),
		/** from the element's inside face, mm */
		depthFromMm: between('depth from the inside face in mm', 0, 3000, 'mm'),
		depthToMm: between('depth from the inside face in mm', 0, 3000, 'mm')
	})
	.refine((v) => v.depthToMm > v.depthFromMm, {
		message: 'must be greater than the depth it starts from',
		path: ['depthToMm']
	});

/** The builder's choices, stored with the junction so the model can be built again from the elements. */
export const junctionDetailsSchema = z.object({
	mode: z.enum(['builder', 'free-form'], { error: 'must be builder or free-form' }),
	elements: z
		.object({
			a: z.uuid({ error: 'must be the id of an element of this dwelling' }).optional(),
			b: z.uuid({ error: 'must be the id of an element of this dwelling' }).optional()
		})
		.default({}),
	/** the stored layer (from 0, inside first) of the first element taken as its main insulation */
	insulationLayer: z
		.number({ error: 'must be a layer number' })
		.int('must be a whole number')
		.min(0)
		.max(99)
		.optional(),
	/** a gap in the first element's main insulation at the junction, filled with a material of λ */
	gap: z
		.object({
			widthMm: between('gap width in mm', 0, 1000, 'mm').gt(0, 'must be > 0 mm'),
			lambda: lambda()
		})
		.nullish(),
	insert: junctionInsertSchema.nullish(),
	/** wall – intermediate floor: the floor slab */
	floorSlab: z
		.object({ thicknessMm: between('slab thickness in mm', 20, 1500, 'mm'), lambda: lambda() })
		.optional(),
	/** window junctions: the panel that stands for the window, and its inside face's depth in the wall */
	window: z
		.object({
			thicknessMm: between('panel thickness in mm', 10, 500, 'mm'),
			positionMm: between('depth of the panel’s inside face in mm', 0, 3000, 'mm').optional()
		})
		.optional(),
	/** wall – ground floor: floor surface above the outside ground, and the wall below the floor */
	ground: z
		.object({
			floorAboveGroundMm: between('floor surface above the ground outside in mm', -1000, 2000, 'mm'),
			wallBelowFloorMm: between('wall below the floor in mm', 0, 5000, 'mm')
		})
		.optional(),
	/** roofs: how far the ceiling or roof layers run over the wall head from its inside face, mm */
	overWallMm: between('layers over the wall head in mm', 0, 3000, 'mm').optional(),
	internal: junctionInternalSchema.optional()
});
export type JunctionDetails = z.output<typeof junctionDetailsSchema>;
export type JunctionInsert = z.output<typeof junctionInsertSchema>;
export type JunctionInternal = z.output<typeof junctionInternalSchema>;

const fields = z.object({
	name: text(120).min(1, 'is required'),
	type: junctionTypeSchema,
	/** m of this junction in the dwelling, in the dimension system of its ψ */
	lengthM: number('length in m').gt(0, 'must be > 0 m').lte(100000, 'must be ≤ 100 000 m'),
	source: z.enum(PSI_SOURCES, { error: 'must be calculated or entered' }),
	dimensionSystem: dimensionSystemSchema,
	psiEntered: between('ψ in W/(m·K)', -10, 10, 'W/(m·K)').nullish(),
	psiSource: text(300).nullish(),
	/** the engine's JunctionInput (free-form); built from `details` when its mode is builder */
	model: z.unknown().optional(),
	details: junctionDetailsSchema.nullish()
});

type Fields = z.output<typeof fields>;

function checkSource(v: Fields, ctx: z.RefinementCtx) {
	const add = (path: string, message: string) => ctx.addIssue({ code: 'custom', path: [path], message });
	if (v.source === 'entered') {
		if (v.psiEntered === null || v.psiEntered === undefined)
			add('psiEntered', 'is required when ψ is entered: the value from the other source, W/(m·K)');
		if (!v.psiSource)
			add('psiSource', 'is required when ψ is entered: name the source (document, table, calculation)');
		return;
	}
	if (!v.details)
		return add('details', 'is required for a calculated junction: builder or free-form, with its choices');
	if (v.details.mode === 'free-form' && (v.model === undefined || v.model === null))
		add('model', 'is required for a free-form junction: regions, boundaries, environments and flanks');
	if (v.details.mode === 'builder') {
		if (v.type === 'other') add('type', 'must be a junction type the builder knows; “other” is free-form');
		if (!v.details.elements.a)
			ctx.addIssue({
				code: 'custom',
				path: ['details', 'elements', 'a'],
				message: 'is required: the element the junction is built from'
			});
	}
}

/** A junction as created (POST) and as the builder pages send it. */
export const junctionFieldsSchema = fields.superRefine(checkSource);
export type JunctionFields = z.output<typeof junctionFieldsSchema>;

/** A junction as replaced (PUT): the fields and the version loaded. */
export const junctionUpdateSchema = fields.extend({ version: versionSchema }).superRefine(checkSource);
