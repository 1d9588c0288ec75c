/**
 * The element result before the moisture checks: U as calculated and as reported, the figures of
 * the thermal model, the temperatures, the notes, warnings and cautions, and the plausibility
 * warnings of the input.
 */
import type { ElementInput, ElementResult, Layer, PlausibilityWarning } from './schema';
import type { ThermalModel } from './element-model';
import type { DesignTemperatures, TemperatureResults } from './element-profile';
import { DEFAULT_ROUNDING_DESCRIPTION, DEFAULT_U_ROUNDING, describeRounding, roundValue } from './rounding';
import { CAUTIONS, ENGINE_VERSION } from './cautions';
import { UNHEATED_SPACE_METHOD, unheatedSpaceOf } from './element-ground';

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
		...unheatedFigures(input, tm),
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
		plausibility: plausibilityWarnings(input),
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
			groundLambdaSource: g.groundLambdaSource,
			wallThicknessM: g.wallThicknessM,
			regime: g.regime,
			rGround: g.rGround,
			...(g.suspended ? { suspended: g.suspended } : {}),
			...(g.basement ? { basement: g.basement } : {}),
			...(g.edge ? { edge: g.edge } : {})
		}
	};
}

/**
 * An element beside an unheated space: Ru and its parts (ISO 6946:2017, 6.10.3, from memory), U0 of
 * the element as if exposed, 1/(RT − Ru), and ISO 13789's b = Hue/(Ai·U0 + Hue), whose b·Ai·U0 is
 * the same heat loss as Ai·U.
 */
function unheatedFigures(input: ElementInput, tm: ThermalModel): Pick<ElementResult, 'unheatedSpace'> {
	const s = unheatedSpaceOf(input);
	if (!s || !input.unheatedSpace) return {};
	const uExposed = 1 / (tm.rTotal - s.ru);
	return {
		unheatedSpace: {
			method: UNHEATED_SPACE_METHOD,
			internalAreaM2: s.internalAreaM2,
			externalElements: input.unheatedSpace.externalElements.map((e) => ({ ...e })),
			transmissionCoefficient: s.transmissionCoefficient,
			airChangeRate: s.airChangeRate,
			airChangeSource: s.airChangeSource,
			volumeM3: input.unheatedSpace.volumeM3,
			ventilationCoefficient: s.ventilationCoefficient,
			heatLossToOutside: s.heatLossToOutside,
			ru: s.ru,
			uExposed,
			adjustmentFactor: s.heatLossToOutside / (s.internalAreaM2 * uExposed + s.heatLossToOutside)
		}
	};
}

/** Thickness above which one layer is implausible, mm. */
export const LAYER_PLAUSIBLE_MAX_MM = 1000; // common practice, no source: no single layer of a building element is over 1 m

/** Inside temperatures outside which a design condition is implausible, °C. */
export const INSIDE_TEMPERATURE_PLAUSIBLE: readonly [min: number, max: number] = [5, 35]; // common practice, no source: a frost-protected store to a warm pool hall

const NO_SOURCE = 'common practice, no source';

/** How a warning names a layer: `Layer 2 “PIR board”`. */
const layerName = (i: number, l: Layer) => `Layer ${i + 1} “${l.name}”`;

/**
 * A layer's thickness (mm) against 1 m, the material's stated range and the thinnest product of its
 * category (both from `layer.plausible`, the library's data): at most one warning, the most specific.
 */
function thicknessWarning(l: Layer, i: number): PlausibilityWarning | null {
	const d = l.thicknessMm;
	const p = l.plausible;
	const at = { kind: 'plausibility' as const, path: `layers.${i}.thicknessMm`, layerIndex: i, value: d };
	if (d > LAYER_PLAUSIBLE_MAX_MM)
		return {
			...at,
			check: 'layer-too-thick',
			message: `${layerName(i, l)} is ${d} mm thick, more than 1 m (${LAYER_PLAUSIBLE_MAX_MM} mm): check that the thickness is in mm.`,
			source: NO_SOURCE
		};
	const min = p?.thicknessMinMm;
	const max = p?.thicknessMaxMm;
	if ((min !== undefined && d < min) || (max !== undefined && d > max)) {
		const range =
			min !== undefined && max !== undefined
				? `${min}–${max} mm`
				: min !== undefined
					? `from ${min} mm`
					: `up to ${max} mm`;
		return {
			...at,
			check: 'thickness-outside-range',
			message: `${layerName(i, l)} is ${d} mm thick; its material is stated to come ${range}: check the thickness or the material.`,
			source: "the material's stated thicknesses (library)"
		};
	}
	if (p?.smallestMm !== undefined && d < p.smallestMm)
		return {
			...at,
			check: 'layer-too-thin',
			message: `${layerName(i, l)} is ${d} mm thick, thinner than the thinnest ${p.category ?? 'product of its kind'} (about ${p.smallestMm} mm): check that the thickness is in mm.`,
			source: NO_SOURCE
		};
	return null;
}

/** A layer's λ (W/(m·K)) against the range its category allows (`layer.plausible`, from the library). */
function lambdaWarning(l: Layer, i: number): PlausibilityWarning | null {
	const p = l.plausible;
	if (l.air || l.lambda === undefined || !p) return null;
	const low = p.lambdaMin !== undefined && l.lambda < p.lambdaMin;
	const high = p.lambdaMax !== undefined && l.lambda > p.lambdaMax;
	if (!low && !high) return null;
	const range =
		p.lambdaMin !== undefined && p.lambdaMax !== undefined
			? `${p.lambdaMin}–${p.lambdaMax} W/(m·K)`
			: low
				? `at least ${p.lambdaMin} W/(m·K)`
				: `at most ${p.lambdaMax} W/(m·K)`;
	return {
		kind: 'plausibility',
		check: 'lambda-outside-range',
		path: `layers.${i}.lambda`,
		layerIndex: i,
		value: l.lambda,
		message: `${layerName(i, l)}: λ = ${l.lambda} W/(m·K) is outside ${range}, what ${p.category ?? 'its category'} usually has: check the value and its unit.`,
		source: p.lambdaSource ?? "the library's range for the category"
	};
}

/**
 * Plausibility warnings of an element input: allowed but unusual values, each a reason to look and
 * never a refusal (the result is calculated as entered). An inside temperature outside 5–35 °C; per
 * layer, a thickness over 1 m, outside its material's stated range or under the thinnest product of
 * its category, and a λ outside its category's range (the last three from `layer.plausible`, which
 * the library supplies). Thresholds: common practice, no source, unless the library names one.
 * Reads the fields as given; safe on any element input, also one not yet validated.
 */
export function plausibilityWarnings(input: ElementInput): PlausibilityWarning[] {
	const out: PlausibilityWarning[] = [];
	const given = input.internal?.temperature;
	const t = typeof given === 'number' ? given : input.designTemperatures?.internal;
	const [tMin, tMax] = INSIDE_TEMPERATURE_PLAUSIBLE;
	if (typeof t === 'number' && (t < tMin || t > tMax))
		out.push({
			kind: 'plausibility',
			check: 'inside-temperature',
			path: typeof given === 'number' ? 'internal.temperature' : 'designTemperatures.internal',
			value: t,
			message: `The inside temperature of ${t} °C is outside the usual ${tMin}–${tMax} °C of heated buildings: check it.`,
			source: NO_SOURCE
		});
	const layers = Array.isArray(input.layers) ? input.layers : [];
	for (let i = 0; i < layers.length; i++) {
		const l = layers[i];
		if (typeof l !== 'object' || l === null || typeof l.thicknessMm !== 'number') continue;
		const thickness = thicknessWarning(l, i);
		if (thickness) out.push(thickness);
		const lambda = lambdaWarning(l, i);
		if (lambda) out.push(lambda);
	}
	return out;
}
