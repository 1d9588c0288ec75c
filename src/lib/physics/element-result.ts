/**
 * The element result before the moisture checks: U as calculated and as reported, the figures of
 * the thermal model, the temperatures, and the notes, warnings and cautions.
 */
import type { ElementInput, ElementResult } from './schema';
import type { ThermalModel } from './element-model';
import type { DesignTemperatures, TemperatureResults } from './element-profile';
import { DEFAULT_ROUNDING_DESCRIPTION, DEFAULT_U_ROUNDING, describeRounding, roundValue } from './rounding';
import { CAUTIONS, ENGINE_VERSION } from './cautions';

/**
 * Result of one element without `surface` and `condensation`: U (W/(m²·K)) unrounded and rounded by
 * the input's rule (default two decimals) with the convention stated, RT and, as they apply, the
 * ground, roof-space and combined-method figures (m²·K/W), ΔU, Rsi and Rse; the design temperatures
 * and temperatures (°C), heat flux of the calculated path (finite-element solve, `fluxPerKelvin`
 * W/(m²·K) times θi − θe) and of the element (U·ΔT), W/m²; the model's notes and warnings (the same
 * arrays, which the moisture checks extend) and the {@link CAUTIONS}.
 */
export function baseResult(
	input: ElementInput,
	tm: ThermalModel,
	design: DesignTemperatures,
	temperatures: TemperatureResults,
	fluxPerKelvin: number
): ElementResult {
	const rounding = input.rounding ?? DEFAULT_U_ROUNDING;
	const dT = design.internal - design.external;
	return {
		engineVersion: ENGINE_VERSION,
		uValue: tm.u,
		uValueRounded: roundValue(tm.u, rounding),
		roundingConvention: input.rounding ? describeRounding(rounding) : DEFAULT_ROUNDING_DESCRIPTION,
		uUncorrected: tm.uUncorrected,
		rTotal: tm.rTotal,
		...(tm.ground ? groundFigures(tm.ground) : {}),
		...(tm.rRoofSpace !== undefined ? { rRoofSpace: tm.rRoofSpace } : {}),
		...(tm.bridged ? { rUpper: tm.rUpper, rLower: tm.rLower, relativeError: tm.relativeError } : {}),
		deltaU: tm.deltaU,
		deltaUAirGaps: tm.deltaUAirGaps,
		deltaUFasteners: tm.deltaUFasteners,
		correctionsApplied: tm.correctionsApplied,
		rsi: tm.rsi,
		rse: tm.rse,
		designTemperatures: { internal: design.internal, external: design.external },
		interfaces: temperatures.interfaces,
		heatFlux: dT * fluxPerKelvin,
		heatFluxElement: tm.u * dT,
		profile: temperatures.profile,
		layers: temperatures.layers,
		notes: tm.notes,
		warnings: tm.warnings,
		cautions: [...CAUTIONS]
	};
}

/** A ground floor's part of the result: U and RT of the build-up alone, and the ISO 13370 figures. */
function groundFigures(
	g: NonNullable<ThermalModel['ground']>
): Pick<ElementResult, 'uBuildUp' | 'rBuildUp' | 'ground'> {
	return {
		uBuildUp: g.uBuildUp,
		rBuildUp: g.rBuildUp,
		ground: {
			method: g.method,
			perimeterM: g.perimeterM,
			areaM2: g.areaM2,
			characteristicDimensionM: g.characteristicDimensionM,
			equivalentThicknessM: g.equivalentThicknessM,
			groundLambda: g.groundLambda,
			wallThicknessM: g.wallThicknessM,
			regime: g.regime,
			rGround: g.rGround
		}
	};
}
