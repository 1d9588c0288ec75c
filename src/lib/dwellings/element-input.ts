/**
 * From a stored element (its `build_up`, `heat_flow` and `internal` columns) and its climate to the
 * engine's `ElementInput`. Pure: used by the editor in the page, by the server when it recomputes,
 * by reports and by audits, so every place computes the same thing from the same record.
 */
import type { SurfaceConditions } from '$lib/physics/surface-films';
import type { ClimateMonth, ElementInput, HeatFlow, Layer, RoofSpace } from '$lib/physics';

/** A layer as stored in `elements.build_up` / `templates.build_up`: the engine's layer plus where it came from. */
export type StoredLayer = Layer & {
	materialId?: string;
	materialRevisionId?: string;
	materialCode?: string;
	/** when given, `bridge.fraction = widthMm / centresMm` is stored as well */
	bridgeGeometry?: { widthMm: number; centresMm: number };
	/** the library material the bridging values were copied from */
	bridgeMaterial?: { materialId: string; materialRevisionId?: string; materialCode?: string };
	/** fastener diameter as entered, mm (the engine takes its cross-section `fasteners.areaMm2`) */
	fastenerDiameterMm?: number;
	/** density ρ, kg/m³, and specific heat capacity c, J/(kg·K): the heat storage only (ISO 13786) */
	density?: number;
	specificHeat?: number;
};

/** A floor on the ground (ISO 13370): exposed perimeter, floor area (else the element's area), ground λ, wall thickness. */
export type StoredGround = {
	perimeterM: number;
	areaM2?: number;
	groundLambda?: number;
	wallThicknessM?: number;
	/** a suspended floor over a ventilated underfloor space (ISO 13370, 8.2) */
	suspended?: NonNullable<ElementInput['ground']>['suspended'];
	/** a heated or unheated basement (ISO 13370, 8.3 and 8.4) */
	basement?: NonNullable<ElementInput['ground']>['basement'];
	/** edge insulation of a slab on the ground (ISO 13370) */
	edge?: NonNullable<ElementInput['ground']>['edge'];
};

/** An unheated space beside the element (ISO 6946, 6.10.3): Ai (else the element's area), the space's outer elements, n or airtightness, V. */
export type StoredUnheatedSpace = Omit<NonNullable<ElementInput['unheatedSpace']>, 'internalAreaM2'> & {
	internalAreaM2?: number;
};

/** Older rows have only rsi/rse/layers; `ground`, `roofSpace` and `inclinationDeg` are optional additions. */
export type StoredBuildUp = {
	rsi?: number;
	rse?: number;
	layers: StoredLayer[];
	ground?: StoredGround;
	roofSpace?: RoofSpace;
	unheatedSpace?: StoredUnheatedSpace;
	/** a roof's inclination from the horizontal, degrees (ISO 6946: 60° or more takes horizontal heat flow) */
	inclinationDeg?: number;
	/** surface conditions other than the conventional ones (ISO 6946, Annex C) */
	surfaceConditions?: SurfaceConditions;
};

export type StoredInternal = {
	temperature: number;
	relativeHumidity?: number;
	humidityClass?: 1 | 2 | 3 | 4 | 5;
};

/** A month of a stored climate, as the calculation core takes it. */
export type ClimateMonthValues = ClimateMonth;

/** Internal design temperature when none is stored, °C. */
export const DEFAULT_INTERNAL_TEMPERATURE = 20; // common practice, no source
/** External design temperature when no climate is attached, °C. */
export const DEFAULT_EXTERNAL_TEMPERATURE = -5; // common practice, no source

const LIBRARY_KEYS = [
	'materialId',
	'materialRevisionId',
	'materialCode',
	'bridgeGeometry',
	'bridgeMaterial',
	'fastenerDiameterMm'
] as const;

/** The engine's layer from a stored layer: library links dropped, bridge geometry turned into a fraction. */
export function toEngineLayer(stored: StoredLayer): Layer {
	const layer: Record<string, unknown> = { ...stored };
	for (const key of LIBRARY_KEYS) delete layer[key];
	const geometry = stored.bridgeGeometry;
	if (stored.bridge) {
		const bridge: Record<string, unknown> = { ...stored.bridge };
		if (geometry && geometry.centresMm > 0) {
			// The fraction is the one input of the combined method; width and centres only produce it.
			bridge.fraction = geometry.widthMm / geometry.centresMm;
			delete bridge.widthMm;
			delete bridge.centresMm;
		}
		layer.bridge = bridge;
	}
	return layer as Layer;
}

/**
 * The engine input for a stored element. Design temperatures for the profile: the internal
 * temperature (else 20 °C) and the coldest month of the climate (else −5 °C). The climate and the
 * moisture checks are included only when twelve months are given.
 */
export function toElementInput(
	el: {
		heatFlow: HeatFlow;
		buildUp: StoredBuildUp | null | undefined;
		internal?: Partial<StoredInternal> | null;
		/** the element's area, m²: the floor area of a ground floor when the build-up does not give one */
		area?: number | null;
	},
	climateMonths?: ClimateMonthValues[] | null
): ElementInput {
	const buildUp = el.buildUp ?? { layers: [] };
	const internalTemperature =
		typeof el.internal?.temperature === 'number' ? el.internal.temperature : DEFAULT_INTERNAL_TEMPERATURE;
	const months = climateMonths && climateMonths.length > 0 ? climateMonths : null;
	const coldest = months ? Math.min(...months.map((m) => m.temperature)) : DEFAULT_EXTERNAL_TEMPERATURE;

	const input: ElementInput = {
		heatFlow: el.heatFlow,
		layers: (buildUp.layers ?? []).map(toEngineLayer),
		designTemperatures: { internal: internalTemperature, external: coldest }
	};
	if (typeof buildUp.rsi === 'number') input.rsi = buildUp.rsi;
	if (typeof buildUp.rse === 'number') input.rse = buildUp.rse;
	if (buildUp.ground) {
		const g = buildUp.ground;
		const ground: Record<string, unknown> = { perimeterM: g.perimeterM };
		const area = g.areaM2 ?? el.area ?? undefined;
		if (area !== undefined) ground.areaM2 = area;
		if (g.groundLambda !== undefined) ground.groundLambda = g.groundLambda;
		if (g.wallThicknessM !== undefined) ground.wallThicknessM = g.wallThicknessM;
		if (g.suspended !== undefined) ground.suspended = g.suspended;
		if (g.basement !== undefined) ground.basement = g.basement;
		if (g.edge !== undefined) ground.edge = g.edge;
		input.ground = ground as ElementInput['ground'];
	}
	if (buildUp.roofSpace !== undefined) input.roofSpace = buildUp.roofSpace;
	if (buildUp.unheatedSpace !== undefined) {
		const s = buildUp.unheatedSpace;
		const ai = s.internalAreaM2 ?? el.area ?? undefined;
		input.unheatedSpace = {
			...s,
			...(ai !== undefined ? { internalAreaM2: ai } : {})
		} as ElementInput['unheatedSpace'];
	}
	if (buildUp.inclinationDeg !== undefined) input.inclinationDeg = buildUp.inclinationDeg;
	if (buildUp.surfaceConditions !== undefined) input.surfaceConditions = buildUp.surfaceConditions;
	if (el.internal) {
		const internal: StoredInternal = { temperature: internalTemperature };
		if (typeof el.internal.relativeHumidity === 'number')
			internal.relativeHumidity = el.internal.relativeHumidity;
		if (typeof el.internal.humidityClass === 'number') internal.humidityClass = el.internal.humidityClass;
		input.internal = internal;
	}
	if (months) {
		input.climate = months.map((m) => ({
			month: m.month,
			temperature: m.temperature,
			relativeHumidity: m.relativeHumidity
		}));
	}
	return input;
}
