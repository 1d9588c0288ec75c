/**
 * ISO 6946 surface resistances and air-layer resistances.
 * Clause and table numbers refer to ISO 6946:2017 (numbering as recalled; the 2007 edition
 * carries the same values in Table 1 and Table 2).
 */

/** Heat-flow directions of ISO 6946:2017, 6.8 (horizontal: within ±30° of the horizontal plane). */
export const HEAT_FLOWS = ['upward', 'horizontal', 'downward'] as const;

/** Direction of the heat flow through an element: the one heat-flow type of the calculation core. */
export type HeatFlow = (typeof HEAT_FLOWS)[number];

/**
 * Angle from the horizontal plane within which a heat flow takes the "horizontal" values, degrees.
 * ISO 6946:2017, 6.8, note to Table 7 (from memory; the note to Table 1 in the 2007 edition): "the
 * values under horizontal apply to directions of heat flow ±30° from the horizontal plane".
 */
export const HORIZONTAL_HEAT_FLOW_WITHIN_DEG = 30;

/**
 * Heat-flow direction through a plane element inclined `inclinationDeg` degrees from the horizontal
 * (0: a flat roof or floor, 90: a wall). The heat flows normal to the element, at 90° − inclination
 * from the horizontal plane; within ±30° of it (an inclination of 60° or more) the horizontal values
 * apply, otherwise the vertical ones in the sense given (upward for a roof in heating conditions,
 * downward for a floor). ISO 6946:2017, 6.8 and note to Table 7 (from memory).
 */
export function heatFlowForInclination(inclinationDeg: number, sense: 'upward' | 'downward'): HeatFlow {
	return 90 - inclinationDeg <= HORIZONTAL_HEAT_FLOW_WITHIN_DEG ? 'horizontal' : sense;
}

/**
 * The heat-flow direction an element's surface and air-layer resistances take: `heatFlow` as given,
 * or with an inclination the direction {@link heatFlowForInclination} gives, `heatFlow` saying the
 * sense (upward or downward; a horizontal one with an inclination below 60° is refused by the schema
 * and taken as upward here).
 */
export function effectiveHeatFlow(e: { heatFlow: HeatFlow; inclinationDeg?: number }): HeatFlow {
	if (e.inclinationDeg === undefined) return e.heatFlow;
	return heatFlowForInclination(e.inclinationDeg, e.heatFlow === 'downward' ? 'downward' : 'upward');
}

/** Conventional internal surface resistance Rsi, m²·K/W, by heat-flow direction. */
export const RSI: Readonly<Record<HeatFlow, number>> = {
	upward: 0.1, // ISO 6946:2017, 6.8 and Table 7
	horizontal: 0.13, // ISO 6946:2017, 6.8 and Table 7 (within ±30° of the horizontal plane)
	downward: 0.17 // ISO 6946:2017, 6.8 and Table 7
};

/** Conventional external surface resistance Rse, m²·K/W (the same for every direction). */
export const RSE = 0.04; // ISO 6946:2017, 6.8 and Table 7

/** Thicknesses (mm) of the rows of the unventilated air-layer table. */
export const AIR_LAYER_THICKNESS_MM = [0, 5, 7, 10, 15, 25, 50, 100, 300] as const; // ISO 6946:2017, Table 8

/** Thermal resistance (m²·K/W) of unventilated air layers with high-emissivity faces, by direction. */
export const AIR_LAYER_RESISTANCE: Readonly<Record<HeatFlow, readonly number[]>> = {
	upward: [0, 0.11, 0.13, 0.15, 0.16, 0.16, 0.16, 0.16, 0.16], // ISO 6946:2017, Table 8
	horizontal: [0, 0.11, 0.13, 0.15, 0.17, 0.18, 0.18, 0.18, 0.18], // ISO 6946:2017, Table 8
	downward: [0, 0.11, 0.13, 0.15, 0.17, 0.19, 0.21, 0.22, 0.23] // ISO 6946:2017, Table 8
};

/** Largest air-layer thickness the table covers, mm. */
export const AIR_LAYER_MAX_MM = 300; // ISO 6946:2017, 6.9.2 (table limit)

/** Opening area limits for air layers, mm² per m length (vertical layers) or per m² (horizontal). */
export const AIR_OPENING_UNVENTILATED_MAX = 500; // ISO 6946:2017, 6.9.2
export const AIR_OPENING_SLIGHTLY_MAX = 1500; // ISO 6946:2017, 6.9.3

/** Cap on the resistance outside a slightly ventilated air layer in the unventilated case, m²·K/W. */
export const SLIGHTLY_VENTILATED_OUTER_CAP = 0.15; // ISO 6946:2017, 6.9.3

/**
 * Thermal resistance of an unventilated air layer with high-emissivity faces, m²·K/W,
 * from its thickness in mm and the heat-flow direction; linear interpolation between the rows
 * of ISO 6946:2017 Table 8 (6.9.2). Throws outside 0–300 mm.
 */
export function unventilatedAirLayerResistance(thicknessMm: number, heatFlow: HeatFlow): number {
	if (!(thicknessMm >= 0 && thicknessMm <= AIR_LAYER_MAX_MM)) {
		throw new RangeError(`air layer thickness ${thicknessMm} mm is outside 0–${AIR_LAYER_MAX_MM} mm`);
	}
	const xs = AIR_LAYER_THICKNESS_MM;
	const ys = AIR_LAYER_RESISTANCE[heatFlow];
	for (let i = 1; i < xs.length; i++) {
		if (thicknessMm <= xs[i]) {
			const t = (thicknessMm - xs[i - 1]) / (xs[i] - xs[i - 1]);
			return ys[i - 1] + t * (ys[i] - ys[i - 1]);
		}
	}
	return ys[ys.length - 1];
}

/**
 * Total thermal resistance of an element with a slightly ventilated air layer, m²·K/W
 * (ISO 6946:2017, 6.9.3): R_T = (1500 − Av)/1000 · R_T,u + (Av − 500)/1000 · R_T,v, where Av is
 * the opening area in mm² (per m length or per m²), R_T,u the total with the layer taken as
 * unventilated and R_T,v the total with it taken as well ventilated.
 */
export function slightlyVentilatedTotal(
	openingAreaMm2: number,
	rTotalUnventilated: number,
	rTotalVentilated: number
): number {
	if (!(openingAreaMm2 > AIR_OPENING_UNVENTILATED_MAX && openingAreaMm2 <= AIR_OPENING_SLIGHTLY_MAX)) {
		throw new RangeError(`opening area ${openingAreaMm2} mm² is not in (500, 1500] mm²`);
	}
	return (
		((1500 - openingAreaMm2) / 1000) * rTotalUnventilated + ((openingAreaMm2 - 500) / 1000) * rTotalVentilated
	);
}

/** Thermal resistance of a homogeneous layer, m²·K/W: R = d/λ with d in mm (ISO 6946:2017, 6.7.1). */
export function layerResistance(thicknessMm: number, lambda: number): number {
	return thicknessMm / 1000 / lambda;
}
