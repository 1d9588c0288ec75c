/**
 * zod schemas of the element input and result. The same schemas serve the forms, the JSON API
 * and the CSV import; every error names the field by its path, e.g. `layers.2.thicknessMm`.
 */
import { z } from 'zod';
import { AIR_LAYER_MAX_MM, AIR_OPENING_SLIGHTLY_MAX, AIR_OPENING_UNVENTILATED_MAX } from './resistances';
import { MAX_BRIDGED_LAYERS } from './bridging';

const describe = (v: unknown): string => {
	if (typeof v === 'number') return Number.isNaN(v) ? 'NaN' : String(v);
	if (v === null) return 'null';
	if (typeof v === 'string') return `the text "${v.length > 20 ? v.slice(0, 20) + '…' : v}"`;
	return typeof v;
};

/** A finite number with plain-English messages. */
const num = () =>
	z.number({
		error: (iss) => (iss.input === undefined ? 'is required' : `must be a finite number, got ${describe(iss.input)}`)
	});
const positive = () => num().gt(0, 'must be > 0');
const nonNegative = () => num().gte(0, 'must be ≥ 0');
const temperature = () => num().gte(-80, 'must be ≥ −80 °C').lte(80, 'must be ≤ 80 °C');

export const heatFlowSchema = z.enum(['upward', 'horizontal', 'downward'], {
	error: (iss) => (iss.input === undefined ? 'is required' : 'must be upward, horizontal or downward')
});

export const bridgeSchema = z
	.object({
		/** thermal conductivity of the bridging material, W/(m·K) */
		lambda: positive(),
		/** area fraction of the bridging material, 0 < f < 1 */
		fraction: num().gt(0, 'must be between 0 and 1 (exclusive)').lt(1, 'must be between 0 and 1 (exclusive)').optional(),
		/** width of one bridging member, mm (with centresMm, instead of fraction) */
		widthMm: positive().optional(),
		/** centre-to-centre spacing of the bridging members, mm */
		centresMm: positive().optional(),
		/** vapour resistance factor of the bridging material (defaults to that of the main material) */
		mu: num().gte(1, 'must be ≥ 1 (still air is 1)').optional(),
		name: z.string().optional()
	})
	.superRefine((b, ctx) => {
		const byWidth = b.widthMm !== undefined || b.centresMm !== undefined;
		if (b.fraction === undefined && !byWidth) {
			ctx.addIssue({ code: 'custom', path: ['fraction'], message: 'give the bridging fraction, or widthMm and centresMm' });
		} else if (b.fraction !== undefined && byWidth) {
			ctx.addIssue({ code: 'custom', path: ['fraction'], message: 'give either fraction or widthMm and centresMm, not both' });
		} else if (byWidth) {
			if (b.widthMm === undefined) ctx.addIssue({ code: 'custom', path: ['widthMm'], message: 'is required with centresMm' });
			else if (b.centresMm === undefined) ctx.addIssue({ code: 'custom', path: ['centresMm'], message: 'is required with widthMm' });
			else if (b.widthMm >= b.centresMm) ctx.addIssue({ code: 'custom', path: ['widthMm'], message: 'must be smaller than centresMm' });
		}
	});

export const fastenersSchema = z.object({
	/** thermal conductivity of the fastener, W/(m·K) */
	lambda: positive(),
	/** cross-sectional area of one fastener, mm² */
	areaMm2: positive(),
	/** number of fasteners per m² */
	perM2: positive(),
	/** length inside the insulation layer, mm (defaults to the layer thickness) */
	penetrationMm: positive().optional()
});

export const layerSchema = z
	.object({
		name: z.string({ error: 'must be text' }),
		/** mm */
		thicknessMm: positive().lte(10000, 'must be ≤ 10 000 mm'),
		/** W/(m·K) */
		lambda: positive().optional(),
		/** m²·K/W, given directly (0 for a thin membrane) */
		resistance: nonNegative().lte(100, 'must be ≤ 100 m²·K/W').optional(),
		air: z
			.enum(['unventilated', 'slightly-ventilated', 'well-ventilated'], {
				error: 'must be unventilated, slightly-ventilated or well-ventilated'
			})
			.optional(),
		/** opening area of an air layer, mm² per m length (vertical) or per m² (horizontal) */
		openingAreaMm2: nonNegative().optional(),
		/** vapour resistance factor, dimensionless */
		mu: num().gte(1, 'must be ≥ 1 (still air is 1)').optional(),
		/** vapour diffusion-equivalent air layer thickness, m */
		sd: nonNegative().lte(100000, 'must be ≤ 100 000 m').optional(),
		/** ISO 6946 air-gap correction level */
		airGapLevel: z.union([z.literal(0), z.literal(1), z.literal(2)], { error: 'must be 0, 1 or 2' }).optional(),
		bridge: bridgeSchema.optional(),
		fasteners: fastenersSchema.optional()
	})
	.superRefine((l, ctx) => {
		if (l.air === undefined) {
			if (l.lambda === undefined && l.resistance === undefined) {
				ctx.addIssue({ code: 'custom', path: ['lambda'], message: 'give λ or the thermal resistance' });
			} else if (l.lambda !== undefined && l.resistance !== undefined) {
				ctx.addIssue({ code: 'custom', path: ['resistance'], message: 'give either λ or the thermal resistance, not both' });
			}
			if (l.openingAreaMm2 !== undefined) {
				ctx.addIssue({ code: 'custom', path: ['openingAreaMm2'], message: 'applies to air layers only' });
			}
		} else {
			if (l.air !== 'well-ventilated' && l.resistance === undefined && l.thicknessMm > AIR_LAYER_MAX_MM) {
				ctx.addIssue({
					code: 'custom',
					path: ['thicknessMm'],
					message: `an air layer over ${AIR_LAYER_MAX_MM} mm is outside the ISO 6946 table; give its resistance directly`
				});
			}
			const a = l.openingAreaMm2;
			if (l.air === 'unventilated' && a !== undefined && a > AIR_OPENING_UNVENTILATED_MAX) {
				ctx.addIssue({ code: 'custom', path: ['openingAreaMm2'], message: `must be ≤ ${AIR_OPENING_UNVENTILATED_MAX} mm² for an unventilated air layer` });
			}
			if (l.air === 'slightly-ventilated') {
				if (a === undefined) ctx.addIssue({ code: 'custom', path: ['openingAreaMm2'], message: 'is required for a slightly ventilated air layer' });
				else if (!(a > AIR_OPENING_UNVENTILATED_MAX && a <= AIR_OPENING_SLIGHTLY_MAX)) {
					ctx.addIssue({ code: 'custom', path: ['openingAreaMm2'], message: 'must be over 500 and at most 1500 mm² for a slightly ventilated air layer' });
				}
			}
			if (l.air === 'well-ventilated') {
				if (a !== undefined && a <= AIR_OPENING_SLIGHTLY_MAX) {
					ctx.addIssue({ code: 'custom', path: ['openingAreaMm2'], message: 'must be over 1500 mm² for a well-ventilated air layer' });
				}
				if (l.bridge) ctx.addIssue({ code: 'custom', path: ['bridge'], message: 'a well-ventilated air layer cannot be bridged' });
			}
		}
		if (l.mu !== undefined && l.sd !== undefined) {
			ctx.addIssue({ code: 'custom', path: ['sd'], message: 'give either μ or sd, not both' });
		}
		if (l.fasteners?.penetrationMm !== undefined && l.fasteners.penetrationMm > l.thicknessMm) {
			ctx.addIssue({ code: 'custom', path: ['fasteners', 'penetrationMm'], message: 'must not exceed the layer thickness' });
		}
	});

export const climateMonthSchema = z.object({
	month: num().int('must be a whole number').gte(1, 'must be 1–12').lte(12, 'must be 1–12'),
	/** monthly mean external temperature, °C */
	temperature: temperature(),
	/** monthly mean external relative humidity, % */
	relativeHumidity: num().gte(0, 'must be 0–100 %').lte(100, 'must be 0–100 %')
});

export const internalSchema = z.object({
	/** °C */
	temperature: temperature(),
	/** % */
	relativeHumidity: num().gt(0, 'must be over 0 %').lte(100, 'must be at most 100 %').optional(),
	humidityClass: z
		.union([z.literal(1), z.literal(2), z.literal(3), z.literal(4), z.literal(5)], { error: 'must be 1, 2, 3, 4 or 5' })
		.optional()
});

export const roundingSchema = z.object({
	mode: z.enum(['decimals', 'significant'], { error: 'must be decimals or significant' }),
	digits: num().int('must be a whole number').gte(0, 'must be 0–6').lte(6, 'must be 0–6')
});

export const moistureLimitsSchema = z.object({
	/** largest acceptable amount at any one interface, g/m² */
	maxAtInterfaceGm2: nonNegative().optional(),
	/** largest acceptable total over all interfaces, g/m² */
	maxTotalGm2: nonNegative().optional(),
	/** whether condensate must evaporate within the year (default true) */
	requireEvaporation: z.boolean({ error: 'must be true or false' }).optional()
});

export const elementInputSchema = z
	.object({
		heatFlow: heatFlowSchema,
		/** m²·K/W; overrides the ISO 6946 value for U and profile */
		rsi: nonNegative().lte(10, 'must be ≤ 10 m²·K/W').optional(),
		/** m²·K/W; overrides the ISO 6946 value for U and profile */
		rse: nonNegative().lte(10, 'must be ≤ 10 m²·K/W').optional(),
		/** from inside to outside */
		layers: z.array(layerSchema, { error: 'must be a list of layers' }).min(1, 'at least one layer is required'),
		/** °C, for the temperature profile */
		designTemperatures: z.object({ internal: temperature(), external: temperature() }).optional(),
		internal: internalSchema.optional(),
		/** twelve months, relative humidity in % */
		climate: z.array(climateMonthSchema, { error: 'must be a list of months' }).optional(),
		/** internal surface resistance for the fRsi check, m²·K/W (ISO 13788: 0.25) */
		surfaceRsi: positive().lte(10, 'must be ≤ 10 m²·K/W').optional(),
		/** ISO 6946 rule (omit ΔU below 3 % of U) or always apply ΔU */
		corrections: z.enum(['standard', 'always'], { error: 'must be standard or always' }).optional(),
		rounding: roundingSchema.optional(),
		moistureLimits: moistureLimitsSchema.optional()
	})
	.superRefine((e, ctx) => {
		const well = e.layers.findIndex((l) => l.air === 'well-ventilated');
		if (well === 0) {
			ctx.addIssue({ code: 'custom', path: ['layers', 0, 'air'], message: 'the first layer cannot be well ventilated: no layer would remain inside it' });
		}
		const active = well < 0 ? e.layers.length : well;
		let slightly = 0;
		let bridged = 0;
		for (let i = 0; i < active; i++) {
			const l = e.layers[i];
			if (l.air === 'slightly-ventilated' && ++slightly > 1) {
				ctx.addIssue({ code: 'custom', path: ['layers', i, 'air'], message: 'only one slightly ventilated air layer is supported' });
			}
			if (l.bridge && ++bridged > MAX_BRIDGED_LAYERS) {
				ctx.addIssue({ code: 'custom', path: ['layers', i, 'bridge'], message: `at most ${MAX_BRIDGED_LAYERS} bridged layers are supported` });
			}
		}
		if (e.internal && e.internal.relativeHumidity !== undefined && e.internal.humidityClass !== undefined) {
			ctx.addIssue({ code: 'custom', path: ['internal', 'humidityClass'], message: 'give either relativeHumidity or humidityClass, not both' });
		}
		if (e.climate !== undefined) {
			if (e.climate.length !== 12) {
				ctx.addIssue({ code: 'custom', path: ['climate'], message: `12 months are required, got ${e.climate.length}` });
			} else {
				const seen = new Map<number, number>();
				e.climate.forEach((m, i) => {
					if (seen.has(m.month)) {
						ctx.addIssue({ code: 'custom', path: ['climate', i, 'month'], message: `month ${m.month} is given twice (also at climate.${seen.get(m.month)})` });
					} else seen.set(m.month, i);
				});
			}
			if (!e.internal) {
				ctx.addIssue({ code: 'custom', path: ['internal'], message: 'internal conditions are required with a climate' });
			} else if (e.internal.relativeHumidity === undefined && e.internal.humidityClass === undefined) {
				ctx.addIssue({ code: 'custom', path: ['internal', 'relativeHumidity'], message: 'give relativeHumidity or humidityClass for the moisture checks' });
			}
			let sdTotal = 0;
			for (let i = 0; i < active; i++) {
				const l = e.layers[i];
				if (l.mu === undefined && l.sd === undefined && l.air === undefined) {
					ctx.addIssue({ code: 'custom', path: ['layers', i, 'mu'], message: 'give μ or sd for the condensation check' });
				}
				sdTotal += l.sd ?? ((l.mu ?? (l.air ? 1 : 0)) * l.thicknessMm) / 1000;
			}
			if (sdTotal <= 0 && e.layers.slice(0, active).every((l) => l.mu !== undefined || l.sd !== undefined || l.air)) {
				ctx.addIssue({ code: 'custom', path: ['layers'], message: 'the total sd-value is zero: the condensation check needs some vapour resistance' });
			}
		}
	});

export type HeatFlowInput = z.infer<typeof heatFlowSchema>;
export type BridgeInput = z.infer<typeof bridgeSchema>;
export type FastenersInput = z.infer<typeof fastenersSchema>;
export type Layer = z.infer<typeof layerSchema>;
export type ClimateMonth = z.infer<typeof climateMonthSchema>;
export type InternalConditions = z.infer<typeof internalSchema>;
export type Rounding = z.infer<typeof roundingSchema>;
export type MoistureLimits = z.infer<typeof moistureLimitsSchema>;
export type ElementInput = z.infer<typeof elementInputSchema>;

/* ------------------------------------------------------------------ result */

const point = z.object({ positionMm: z.number(), temperature: z.number() });

export const layerResultSchema = z.object({
	index: z.number().int(),
	name: z.string(),
	thicknessMm: z.number(),
	positionStartMm: z.number(),
	positionEndMm: z.number(),
	kind: z.enum(['material', 'resistance', 'air-unventilated', 'air-slightly-ventilated', 'air-well-ventilated']),
	/** resistance used along the calculation path (main material of a bridged layer), m²·K/W */
	r: z.number(),
	rBridge: z.number().optional(),
	bridgeFraction: z.number().optional(),
	/** equivalent resistance of a bridged layer in the lower limit, m²·K/W */
	rEquivalent: z.number(),
	/** m, null when no vapour data is given */
	sd: z.number().nullable(),
	temperatureInside: z.number(),
	temperatureOutside: z.number(),
	/** outside a well-ventilated air layer (or that layer itself): not part of U or the moisture checks */
	disregarded: z.boolean()
});

export const surfaceMonthSchema = z.object({
	month: z.number(),
	externalTemperature: z.number(),
	internalVapourPressure: z.number(),
	minSaturationPressure: z.number(),
	minSurfaceTemperature: z.number(),
	fRsiMin: z.number().nullable()
});

export const surfaceResultSchema = z.object({
	fRsi: z.number(),
	fRsiMin: z.number(),
	criticalMonth: z.number(),
	pass: z.boolean(),
	rsiUsed: z.number(),
	/** for bridged elements: fRsi of the section with the lowest resistance (1-D estimate) */
	fRsiLowestSection: z.number().optional(),
	months: z.array(surfaceMonthSchema)
});

export const glaserNodeSchema = z.object({
	index: z.number(),
	positionMm: z.number(),
	positionStartMm: z.number(),
	sdM: z.number(),
	layerIndex: z.number(),
	kind: z.enum(['internal-surface', 'interface', 'sublayer', 'external-surface'])
});

export const glaserMonthSchema = z.object({
	month: z.number(),
	days: z.number(),
	externalTemperature: z.number(),
	externalVapourPressure: z.number(),
	internalTemperature: z.number(),
	internalVapourPressure: z.number(),
	temperature: z.array(z.number()),
	saturationPressure: z.array(z.number()),
	vapourPressure: z.array(z.number()),
	rate: z.array(z.number()),
	accumulatedAt: z.array(z.number()),
	accumulated: z.number(),
	condensed: z.number(),
	evaporated: z.number()
});

export const condensationResultSchema = z.object({
	months: z.array(glaserMonthSchema),
	maxAccumulation: z.number(),
	peakMonth: z.number().nullable(),
	maxAtInterface: z.number(),
	maxAtInterfaceNode: z.number().nullable(),
	evaporatesFully: z.boolean(),
	condensationMonths: z.array(z.number()),
	outcome: z.enum(['none', 'dries', 'accumulates']),
	startMonth: z.number().nullable(),
	condensesEveryMonth: z.boolean(),
	surfaceCondensationMonths: z.array(z.number()),
	nodes: z.array(glaserNodeSchema),
	vapourProfile: z.object({
		month: z.number(),
		points: z.array(
			z.object({ positionMm: z.number(), sdM: z.number(), temperature: z.number(), saturationPressure: z.number(), vapourPressure: z.number() })
		)
	}),
	acceptance: z.object({ pass: z.boolean(), reasons: z.array(z.string()) })
});

export const elementResultSchema = z.object({
	engineVersion: z.string(),
	uValue: z.number(),
	uValueRounded: z.number(),
	roundingConvention: z.string(),
	/** U before corrections, W/(m²·K) */
	uUncorrected: z.number(),
	rTotal: z.number(),
	rUpper: z.number().optional(),
	rLower: z.number().optional(),
	relativeError: z.number().optional(),
	deltaU: z.number(),
	deltaUAirGaps: z.number(),
	deltaUFasteners: z.number(),
	correctionsApplied: z.boolean(),
	rsi: z.number(),
	rse: z.number(),
	designTemperatures: z.object({ internal: z.number(), external: z.number() }),
	interfaces: z.array(point),
	heatFlux: z.number(),
	heatFluxElement: z.number(),
	profile: z.array(point),
	layers: z.array(layerResultSchema),
	surface: surfaceResultSchema.optional(),
	condensation: condensationResultSchema.optional(),
	notes: z.array(z.string()),
	warnings: z.array(z.string()),
	cautions: z.array(z.string())
});

export type LayerResult = z.infer<typeof layerResultSchema>;
export type SurfaceResult = z.infer<typeof surfaceResultSchema>;
export type CondensationResult = z.infer<typeof condensationResultSchema>;
export type ElementResult = z.infer<typeof elementResultSchema>;

/* ------------------------------------------------------------------ parsing */

export interface FieldIssue {
	/** dotted path, e.g. `layers.2.thicknessMm` */
	path: string;
	message: string;
}

/** Flatten zod issues to `{ path, message }` with dotted paths. */
export function formatIssues(error: z.ZodError): FieldIssue[] {
	return error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(input)', message: i.message }));
}

/** Thrown by the engine for invalid input; `issues` name each field, `message` lists them. */
export class ElementInputError extends Error {
	readonly issues: FieldIssue[];
	constructor(issues: FieldIssue[]) {
		super(issues.map((i) => `${i.path}: ${i.message}`).join('; '));
		this.name = 'ElementInputError';
		this.issues = issues;
	}
}

/** Validate raw input (form, JSON, CSV row) without throwing. */
export function parseElementInput(raw: unknown): { ok: true; data: ElementInput } | { ok: false; issues: FieldIssue[] } {
	const r = elementInputSchema.safeParse(raw);
	return r.success ? { ok: true, data: r.data } : { ok: false, issues: formatIssues(r.error) };
}

/** Validate raw input; throws {@link ElementInputError} naming every bad field. */
export function assertElementInput(raw: unknown): ElementInput {
	const r = parseElementInput(raw);
	if (!r.ok) throw new ElementInputError(r.issues);
	return r.data;
}
