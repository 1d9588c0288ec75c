/**
 * Envelo calculation core — the public face. Pure TypeScript: no I/O, no clock, no framework.
 *
 * ISO 6946 U-values (surface and air-layer resistances, combined method for bridged layers, ΔU
 * corrections), a 1-D finite-element conduction solve for the temperature profile, and the
 * ISO 13788 surface-humidity (fRsi) and monthly Glaser interstitial-condensation checks; floors on
 * the ground by ISO 13370 (slab on ground) and roof spaces above insulated ceilings (ISO 6946).
 */
export { analyseElement, buildThermalModel, GLASER_SUBLAYER_MAX_R, GLASER_SUBLAYERS_MAX } from './element';
export {
	LAYER_R_MAX,
	TOTAL_R_MAX,
	R_NEGLIGIBLE,
	SD_NEGLIGIBLE,
	LAYER_SD_MAX,
	MU_MAX,
	THICKNESS_MIN_MM,
	THICKNESS_MAX_MM,
	LAYERS_MAX,
	NAME_MAX,
	BRIDGE_SPACING_MAX_MM,
	FASTENER_LAMBDA_MAX,
	FASTENER_AREA_MAX_MM2,
	FASTENERS_PER_M2_MAX,
	CHARACTERISTIC_DIMENSION_MAX_M
} from './bounds';
export type { ThermalModel, LayerModel } from './element';
export { solveThickness, solveThicknessDetailed } from './inverse';
export type { ThicknessSolution, ThicknessOutcome, ThicknessOptions } from './inverse';
export { plausibilityWarnings, LAYER_PLAUSIBLE_MAX_MM, INSIDE_TEMPERATURE_PLAUSIBLE } from './element-result';
export {
	saturationPressure,
	saturationTemperature,
	humidityClassExcess,
	internalVapourPressure,
	vapourThickness,
	temperatureFactor,
	minimumTemperatureFactor,
	DELTA_0,
	RSI_SURFACE_CHECK,
	SURFACE_RH_CRITICAL,
	HUMIDITY_CLASS_EXCESS,
	HUMIDITY_CLASS_SAFETY_FACTOR,
	MONTH_DAYS
} from './moisture';
export {
	RSI,
	RSE,
	AIR_LAYER_THICKNESS_MM,
	AIR_LAYER_RESISTANCE,
	unventilatedAirLayerResistance,
	slightlyVentilatedTotal,
	layerResistance,
	heatFlowForInclination,
	effectiveHeatFlow,
	HORIZONTAL_HEAT_FLOW_WITHIN_DEG
} from './resistances';
export { HEAT_FLOWS, type HeatFlow } from './resistances';
export { combinedMethod, bridgeFraction, COMBINED_METHOD_MAX_RATIO } from './bridging';
export type { CombinedResult, SeriesLayerR } from './bridging';
export {
	airGapCorrection,
	fastenerCorrection,
	applyCorrections,
	AIR_GAP_DELTA_U2,
	CORRECTION_OMIT_FRACTION
} from './corrections';
export { solveSeries, createSeriesWork } from './series';
export type { SeriesWork } from './series';
export { runGlaser } from './glaser';
export type { GlaserChain, GlaserMonth, GlaserResult, GlaserNode, GlaserMonthResult } from './glaser';
export { roundValue, describeRounding, DEFAULT_U_ROUNDING } from './rounding';
export type { RoundingRule } from './rounding';
export { ENGINE_VERSION, CAUTIONS } from './cautions';
export {
	slabOnGroundU,
	characteristicDimension,
	GROUND_LAMBDA,
	GROUND_LAMBDA_DEFAULT,
	GROUND_LAMBDA_SOURCE,
	GROUND_KIND_LABELS,
	groundKindOf,
	groundLambdaSource,
	ROOF_SPACE_SOURCE,
	WALL_THICKNESS_DEFAULT_M,
	ROOF_SPACES,
	ROOF_SPACE_RESISTANCE,
	ROOF_SPACE_LABELS
} from './ground';
export type { GroundFloorInput, GroundFloorResult, GroundKind, RoofSpace } from './ground';
export {
	elementInputSchema,
	layerSchema,
	bridgeSchema,
	fastenersSchema,
	climateMonthSchema,
	internalSchema,
	elementResultSchema,
	layerResultSchema,
	surfaceResultSchema,
	condensationResultSchema,
	groundResultSchema,
	plausibilityWarningSchema,
	roofSpaceSchema,
	parseElementInput,
	assertElementInput,
	formatIssues,
	ElementInputError
} from './schema';
export type {
	ElementInput,
	ElementResult,
	Layer,
	ClimateMonth,
	InternalConditions,
	LayerResult,
	SurfaceResult,
	CondensationResult,
	FieldIssue,
	MoistureLimits,
	PlausibilityWarning,
	Rounding
} from './schema';
