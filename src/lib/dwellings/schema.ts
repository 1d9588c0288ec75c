/**
 * zod schemas of dwellings and elements, shared by the pages, the JSON API, the server modules and the
 * OpenAPI document. Physics fields reuse the engine's own schemas so a layer is checked the same way
 * everywhere; element-level checks (climate needs internal conditions, μ for the condensation check…)
 * come from the engine's `parseElementInput` on the composed input (see `validateElement`).
 */
import { z } from 'zod';
import {
	DEFAULT_HEAT_FLOW,
	DWELLING_STATUSES,
	ELEMENT_KINDS,
	GIVEN_U_KINDS,
	type ElementKind
} from '$lib/dwellings/kinds';
import { HEAT_FLOWS, internalSchema, layerSchema, parseElementInput, roofSpaceSchema } from '$lib/physics';
import { AIRTIGHTNESS_TYPES } from '$lib/physics/unheated-space';
import {
	DYNAMIC_DENSITY_MAX,
	DYNAMIC_DENSITY_MIN,
	DYNAMIC_SPECIFIC_HEAT_MAX,
	DYNAMIC_SPECIFIC_HEAT_MIN
} from '$lib/physics/dynamic';
import { toElementInput, type ClimateMonthValues, type StoredBuildUp } from '$lib/dwellings/element-input';
import { ELEMENTS_MAX, pageQuery, versionSchema } from '$lib/validation';
import { checkWindowParts } from '$lib/dwellings/window-parts';
import { surfaceConditionsSchema } from '$lib/physics/surface-films';

export { versionSchema };

const text = (max: number, what = 'text') =>
	z
		.string({ error: `must be ${what}` })
		.trim()
		.max(max, `must be at most ${max} characters`);
const optionalText = (max: number) =>
	z
		.string({ error: 'must be text' })
		.trim()
		.max(max, `must be at most ${max} characters`)
		.nullish()
		.transform((v) => (v ? v : null));
const uuidOrNull = z
	.union([z.uuid({ error: 'must be an id' }), z.literal(''), z.null()])
	.optional()
	.transform((v) => (v ? v : null));

export const STAGES = ['design', 'as-built'] as const;
export type Stage = (typeof STAGES)[number];
export const STAGE_LABELS: Record<Stage, string> = { design: 'Design', 'as-built': 'As built' };

export const elementKindSchema = z.enum(ELEMENT_KINDS, {
	error: `must be one of ${ELEMENT_KINDS.join(', ')}`
});
export const heatFlowSchema = z.enum(HEAT_FLOWS, {
	error: 'must be upward, horizontal or downward'
});

/* ------------------------------------------------------------ dwellings */

export const dwellingFieldsSchema = z.object({
	reference: text(60).min(1, 'is required'),
	address: text(300).default(''),
	programme: optionalText(120),
	clientName: optionalText(160),
	clientEmail: z
		.union([z.email({ error: 'must be an e-mail address' }), z.literal(''), z.null()])
		.optional()
		.transform((v) => (v ? v.toLowerCase() : null)),
	assessorId: uuidOrNull,
	stage: z.enum(STAGES, { error: 'must be design or as-built' }).default('design'),
	limitTableId: uuidOrNull,
	climateId: uuidOrNull,
	/** total floor area, m², for the figures per floor area (the heat-capacity parameter); null until given */
	floorArea: z
		.number({ error: 'must be a number in m²' })
		.gt(0, 'must be > 0 m²')
		.lte(100000, 'must be ≤ 100 000 m²')
		.nullish()
		.transform((v) => v ?? null)
});

/** Reopening an accepted dwelling, or one awaiting review, for changes: the reason, in a supervisor's words. */
export const reopenSchema = z.object({
	reason: z
		.string({ error: 'say why the dwelling changes' })
		.trim()
		.min(10, 'say why the dwelling changes, in at least 10 characters')
		.max(2000, 'must be at most 2,000 characters'),
	version: versionSchema
});
export type ReopenInput = z.infer<typeof reopenSchema>;

export const dwellingUpdateSchema = dwellingFieldsSchema.partial().extend({ version: versionSchema });

export const dwellingCopySchema = z.object({
	reference: text(60).min(1, 'is required'),
	address: text(300).optional(),
	/** copy a design-stage dwelling as its as-built record, keeping the link for the comparison */
	asBuilt: z.boolean({ error: 'must be true or false' }).optional()
});

export const DWELLING_SORTS = ['reference', 'address', 'status', 'updated', 'assessor'] as const;
export const dwellingListQuerySchema = z.object({
	q: z
		.string()
		.trim()
		.max(100, 'must be at most 100 characters')
		.refine((v) => !v.includes('\u0000'), 'must not contain a zero byte (U+0000)')
		.optional()
		.default(''),
	status: z
		.enum([...DWELLING_STATUSES, 'active', 'all', ''], {
			error: `must be one of ${DWELLING_STATUSES.join(', ')}, active (all but archived) or all`
		})
		.optional()
		.default('active'),
	assessorId: z
		.union([z.uuid({ error: 'must be an id' }), z.literal('')])
		.optional()
		.default(''),
	/** only dwellings that differ from their latest issued dwelling report */
	changed: z
		.enum(['', '0', '1', 'true', 'false'], { error: 'must be 1 (only changed since issue) or left out' })
		.optional()
		.default('')
		.transform((v) => v === '1' || v === 'true'),
	sort: z.enum(DWELLING_SORTS, { error: `must be one of ${DWELLING_SORTS.join(', ')}` }).default('updated'),
	dir: z.enum(['asc', 'desc'], { error: 'must be asc or desc' }).default('desc'),
	...pageQuery(25, 100)
});
export type DwellingListQuery = z.output<typeof dwellingListQuerySchema>;

/* ------------------------------------------------------------ elements */

export const storedLayerSchema = layerSchema.safeExtend({
	materialId: z.uuid({ error: 'must be a material id' }).optional(),
	materialRevisionId: z.uuid({ error: 'must be a material revision id' }).optional(),
	materialCode: z.string().max(60).optional(),
	bridgeGeometry: z
		.object({
			widthMm: z.number({ error: 'must be a number' }).gt(0, 'must be > 0'),
			centresMm: z.number({ error: 'must be a number' }).gt(0, 'must be > 0')
		})
		.optional(),
	/** the library material the bridging λ (and μ) were copied from, as a layer records its own */
	bridgeMaterial: z
		.object({
			materialId: z.uuid({ error: 'must be a material id' }),
			materialRevisionId: z.uuid({ error: 'must be a material revision id' }).optional(),
			materialCode: z.string().max(60).optional()
		})
		.optional(),
	fastenerDiameterMm: z.number({ error: 'must be a number in mm' }).gt(0, 'must be > 0 mm').optional(),
	/** for the heat storage (ISO 13786) only; the U-value and the moisture checks do not use them */
	density: z
		.number({ error: 'must be a number in kg/m³' })
		.gte(DYNAMIC_DENSITY_MIN, `must be at least ${DYNAMIC_DENSITY_MIN} kg/m³`)
		.lte(DYNAMIC_DENSITY_MAX, `must be at most ${DYNAMIC_DENSITY_MAX} kg/m³`)
		.optional(),
	specificHeat: z
		.number({ error: 'must be a number in J/(kg·K)' })
		.gte(
			DYNAMIC_SPECIFIC_HEAT_MIN,
			`must be at least ${DYNAMIC_SPECIFIC_HEAT_MIN} J/(kg·K) (a value in kJ/(kg·K) is multiplied by 1000)`
		)
		.lte(DYNAMIC_SPECIFIC_HEAT_MAX, `must be at most ${DYNAMIC_SPECIFIC_HEAT_MAX} J/(kg·K)`)
		.optional()
});

export const storedBuildUpSchema = z.object({
	rsi: z
		.number({ error: 'must be a number' })
		.gte(0, 'must be ≥ 0')
		.lte(10, 'must be ≤ 10 m²·K/W')
		.optional(),
	rse: z
		.number({ error: 'must be a number' })
		.gte(0, 'must be ≥ 0')
		.lte(10, 'must be ≤ 10 m²·K/W')
		.optional(),
	/** surface conditions other than the conventional ones (ISO 6946, Annex C): emissivities, wind speed */
	surfaceConditions: surfaceConditionsSchema.optional(),
	layers: z
		.array(storedLayerSchema, { error: 'must be a list of layers' })
		.min(1, 'at least one layer is required')
		.max(40, 'at most 40 layers'),
	/** floor on the ground (ISO 13370); ranges are checked by the engine */
	ground: z
		.object({
			perimeterM: z.number({
				error: (iss) =>
					iss.input === undefined
						? 'is required: the exposed perimeter of the floor, m'
						: 'must be a number in m'
			}),
			areaM2: z.number({ error: 'must be a number in m²' }).optional(),
			groundLambda: z.number({ error: 'must be a number in W/(m·K)' }).optional(),
			wallThicknessM: z.number({ error: 'must be a number in m' }).optional(),
			/** a suspended floor; ranges are checked by the engine */
			suspended: z
				.object({
					heightM: z.number({ error: 'must be a number in m' }),
					underfloorWallU: z.number({ error: 'must be a number in W/(m²·K)' }),
					openingsPerPerimeter: z.number({ error: 'must be a number in m²/m' }),
					windSpeed: z.number({ error: 'must be a number in m/s' }),
					windShielding: z.enum(['sheltered', 'average', 'exposed'], {
						error: 'must be sheltered, average or exposed'
					})
				})
				.optional(),
			/** a heated or unheated basement (ISO 13370, 8.3, 8.4); ranges are checked by the engine */
			basement: z
				.object({
					kind: z.enum(['heated', 'unheated'], { error: 'must be heated or unheated' }),
					depthM: z.number({ error: 'must be a number in m' }),
					wallR: z.number({ error: 'must be a number in m²·K/W' }),
					floorR: z.number({ error: 'must be a number in m²·K/W' }).optional(),
					wallAboveGroundHeightM: z.number({ error: 'must be a number in m' }).optional(),
					wallAboveGroundU: z.number({ error: 'must be a number in W/(m²·K)' }).optional(),
					airChangeRate: z.number({ error: 'must be a number in h⁻¹' }).optional(),
					volumeM3: z.number({ error: 'must be a number in m³' }).optional()
				})
				.optional(),
			/** edge insulation of a slab (ISO 13370); ranges are checked by the engine */
			edge: z
				.object({
					orientation: z.enum(['horizontal', 'vertical'], { error: 'must be horizontal or vertical' }),
					widthM: z.number({ error: 'must be a number in m' }),
					insulationThicknessM: z.number({ error: 'must be a number in m' }),
					insulationR: z.number({ error: 'must be a number in m²·K/W' }).optional(),
					insulationLambda: z.number({ error: 'must be a number in W/(m·K)' }).optional()
				})
				.optional()
		})
		.optional(),
	/** roof space above an insulated ceiling (ISO 6946 roof-space resistance) */
	roofSpace: roofSpaceSchema.optional(),
	/** an unheated space beside the element (ISO 6946, 6.10.3); ranges are checked by the engine */
	unheatedSpace: z
		.object({
			internalAreaM2: z.number({ error: 'must be a number in m²' }).optional(),
			externalElements: z
				.array(
					z.object({
						name: z.string({ error: 'must be text' }).max(120, 'must be at most 120 characters').optional(),
						areaM2: z.number({ error: 'must be a number in m²' }),
						uValue: z.number({ error: 'must be a number in W/(m²·K)' })
					}),
					{ error: 'must be a list of elements' }
				)
				.max(100, 'at most 100 elements'),
			airChangeRate: z.number({ error: 'must be a number in h⁻¹' }).optional(),
			airtightness: z
				.enum(AIRTIGHTNESS_TYPES, { error: 'must be one of the airtightness types of ISO 13789' })
				.optional(),
			volumeM3: z.number({ error: 'must be a number in m³' })
		})
		.optional(),
	/** a roof's inclination from the horizontal, degrees; ranges are checked by the engine */
	inclinationDeg: z.number({ error: 'must be a number of degrees from the horizontal' }).optional()
});

export const elementFieldsSchema = z.object({
	name: text(120).min(1, 'is required'),
	kind: elementKindSchema,
	area: z
		.number({ error: 'must be a number in m²' })
		.gt(0, 'must be > 0 m²')
		.lte(100000, 'must be ≤ 100 000 m²'),
	heatFlow: heatFlowSchema.optional(),
	position: z
		.number({ error: 'must be a whole number' })
		.int('must be a whole number')
		.min(0, 'must be ≥ 0')
		.max(ELEMENTS_MAX, `must be at most ${ELEMENTS_MAX}`)
		.optional(),
	buildUp: storedBuildUpSchema.nullish(),
	givenU: z
		.number({ error: 'must be a number in W/(m²·K)' })
		.gt(0, 'must be > 0 W/(m²·K)')
		.lte(10, 'must be ≤ 10 W/(m²·K)')
		.nullish(),
	givenUSource: optionalText(300),
	/** a window's or door's parts by ISO 10077-1 (glazing, frame, panel); checked by the window calculation */
	windowParts: z
		.record(z.string(), z.unknown(), { error: 'must be the window’s parts as an object' })
		.nullish(),
	climateId: uuidOrNull,
	internal: internalSchema.nullish()
});
export type ElementFields = z.output<typeof elementFieldsSchema>;

export const elementUpdateSchema = elementFieldsSchema.extend({ version: versionSchema });

/** Common insulation board and roll thicknesses, mm, for "thickness to meet the limit". */
export const PRODUCT_THICKNESSES_MM = [
	20, 25, 30, 40, 50, 60, 70, 75, 80, 90, 100, 110, 120, 125, 130, 140, 150, 160, 170, 180, 200, 220, 240,
	250, 260, 280, 300, 320, 350, 400
] as const; // common practice, no source

export const isGivenU = (kind: ElementKind) => GIVEN_U_KINDS.includes(kind);

export type FieldIssue = { path: string; message: string };

/**
 * Put the stored form in order before validation: bridging given by member width and centres gets
 * its fraction (contracts: both are stored); empty optional numbers are dropped.
 */
export function normaliseBuildUp(buildUp: StoredBuildUp): StoredBuildUp {
	return {
		...buildUp,
		layers: buildUp.layers.map((l) => {
			const g = l.bridgeGeometry;
			if (l.bridge && g && g.centresMm > 0)
				return { ...l, bridge: { ...l.bridge, fraction: g.widthMm / g.centresMm } };
			return l;
		})
	};
}

/**
 * Full validation of an element as entered: its fields, then the engine's checks on the input it makes
 * with the given climate. Paths name the element's own fields (`buildUp.layers.2.thicknessMm`).
 */
export function validateElement(
	raw: unknown,
	climateMonths: ClimateMonthValues[] | null
): { ok: true; data: ElementFields } | { ok: false; issues: FieldIssue[] } {
	const parsed = elementFieldsSchema.safeParse(raw);
	if (!parsed.success) {
		return {
			ok: false,
			issues: parsed.error.issues.map((i) => ({
				path: i.path.map(String).join('.') || '(body)',
				message: i.message
			}))
		};
	}
	const data = parsed.data;
	const issues: FieldIssue[] = [];
	if (data.windowParts != null && !isGivenU(data.kind))
		return { ok: false, issues: [{ path: 'windowParts', message: 'are kept for a window or door only' }] };
	if (isGivenU(data.kind) && data.windowParts != null) {
		// the parts give the U (and, when none is written, its source); a different given U is refused
		const checked = checkWindowParts(data.windowParts, data.kind as 'window' | 'door', data.givenU ?? null);
		if (!checked.ok) return { ok: false, issues: checked.issues };
		data.windowParts = checked.parts;
		data.givenU = checked.u;
		data.givenUSource ||= checked.source;
	}
	if (isGivenU(data.kind)) {
		if (data.givenU == null)
			issues.push({ path: 'givenU', message: 'is required for a window or door (W/(m²·K))' });
		if (!data.givenUSource)
			issues.push({ path: 'givenUSource', message: 'is required: where the given U-value comes from' });
		if (issues.length) return { ok: false, issues };
		return { ok: true, data: { ...data, buildUp: null, windowParts: data.windowParts ?? null } };
	}
	if (!data.buildUp)
		return { ok: false, issues: [{ path: 'buildUp', message: 'is required: at least one layer' }] };
	data.buildUp = normaliseBuildUp(data.buildUp as StoredBuildUp) as ElementFields['buildUp'];
	// The floor area of a ground floor defaults to the element's area, and is stored with it so that
	// every later recompute (reports, audits) reads the same input from the build-up alone.
	if (data.buildUp?.ground && data.buildUp.ground.areaM2 === undefined)
		data.buildUp.ground = { ...data.buildUp.ground, areaM2: data.area };
	// likewise the area Ai between the heated and an unheated space
	if (data.buildUp?.unheatedSpace && data.buildUp.unheatedSpace.internalAreaM2 === undefined)
		data.buildUp.unheatedSpace = { ...data.buildUp.unheatedSpace, internalAreaM2: data.area };
	const input = toElementInput(
		{
			// the direction the server will store when none is given
			heatFlow: data.heatFlow ?? DEFAULT_HEAT_FLOW[data.kind],
			buildUp: data.buildUp as StoredBuildUp,
			internal: data.internal,
			area: data.area
		},
		climateMonths
	);
	const engine = parseElementInput(input);
	if (!engine.ok) {
		for (const i of engine.issues) {
			let path = i.path;
			if (path.startsWith('layers')) path = `buildUp.${path}`;
			else if (
				path === 'rsi' ||
				path === 'rse' ||
				path.startsWith('surfaceConditions') ||
				path === 'roofSpace' ||
				path === 'inclinationDeg' ||
				path.startsWith('ground') ||
				path.startsWith('unheatedSpace')
			)
				path = `buildUp.${path}`;
			else if (path.startsWith('climate')) path = 'climateId';
			else if (path.startsWith('designTemperatures')) path = 'internal.temperature';
			issues.push({ path, message: i.message });
		}
		return { ok: false, issues };
	}
	return { ok: true, data };
}

export const archiveSchema = z.object({
	archived: z.boolean({ error: 'must be true (archive) or false (restore to draft)' }),
	version: versionSchema
});

export const thicknessRequestSchema = z.object({
	/** the physics ElementInput */
	input: z.unknown(),
	layerIndex: z
		.number({ error: 'must be a layer index' })
		.int('must be a whole number')
		.min(0, 'must be ≥ 0')
		.max(999, 'must be at most 999'),
	targetU: z.number({ error: 'must be a number in W/(m²·K)' }).gt(0, 'must be > 0'),
	productThicknessesMm: z.array(z.number().gt(0, 'must be > 0')).max(200).optional(),
	/** meet: the current thickness if it already meets the target, else the least that does; thinnest: always the least */
	mode: z
		.enum(['meet', 'thinnest'], {
			error:
				'must be meet (the default: nothing is proposed when the layer already meets the target) or thinnest'
		})
		.optional()
});
