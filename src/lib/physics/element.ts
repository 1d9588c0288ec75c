/**
 * `analyseElement`: the U-value (ISO 6946), the temperature profile from the finite-element
 * solve, the surface-humidity check by fRsi and the monthly Glaser cycle (ISO 13788), composed
 * into one result. Each step lives beside this file:
 *
 * | Step | File |
 * | --- | --- |
 * | Rsi, Rse by heat-flow direction; well-ventilated air layers | `element-films.ts` |
 * | layers → kinds, resistances, bridges, sd-values | `element-layers.ts` |
 * | RT: combined method, slightly ventilated air layers | `element-combined.ts` |
 * | roof space; floor on the ground | `element-ground.ts` |
 * | ΔU corrections and the 3 % rule | `element-corrections.ts` |
 * | finite-element heat chain and its solve | `element-heat-chain.ts` |
 * | design temperatures, temperatures and profile | `element-profile.ts` |
 * | the result, notes and cautions | `element-result.ts` |
 * | monthly moisture conditions | `element-moisture.ts` |
 * | surface humidity (fRsi) | `element-surface.ts` |
 * | interstitial condensation (Glaser) | `element-glaser.ts` |
 */
import { checkedElementInput, ElementInputError, type ElementInput, type ElementResult } from './schema';
import { RSI_SURFACE_CHECK } from './moisture';
import type { ThermalModel } from './element-model';
import { surfaceResistances } from './element-films';
import { modelLayers } from './element-layers';
import { bridgingNotes, totalResistance } from './element-combined';
import { groundFloorModel, roofSpaceResistance } from './element-ground';
import { elementCorrections } from './element-corrections';
import { buildHeatChain, solveHeatChain } from './element-heat-chain';
import { designTemperatures, temperatureResults } from './element-profile';
import { baseResult } from './element-result';
import { groundCondensationNote, moistureSkippedNote, monthlyConditions } from './element-moisture';
import { surfaceCheck } from './element-surface';
import { condensationCheck } from './element-glaser';

export { GLASER_SUBLAYER_MAX_R, GLASER_SUBLAYERS_MAX } from './element-heat-chain';
export type { LayerModel, ThermalModel } from './element-model';

/**
 * Refuses an element whose total resistance RT (m²·K/W) is not above zero: U would be infinite.
 * `parseElementInput` refuses such an input already; this holds for a thickness override (the
 * inverse solve's thickness 0).
 */
function requirePositiveResistance(rTotal: number): void {
	if (!(rTotal > 0)) {
		throw new ElementInputError([
			{
				path: 'layers',
				message: 'the total thermal resistance is zero: give Rsi, Rse or a layer with resistance'
			}
		]);
	}
}

/**
 * Build the ISO 6946 thermal model of a validated element: surface resistances (6.8), layer and
 * air-layer resistances (6.7.1, 6.9), the combined method for bridged layers (6.7.2), and the ΔU
 * corrections with their omission rule (Annex F, clause 7). `override` replaces the thickness of
 * one layer (used by the inverse solve). Resistances m²·K/W, U W/(m²·K).
 */
export function buildThermalModel(
	input: ElementInput,
	override?: { index: number; thicknessMm: number }
): ThermalModel {
	const notes: string[] = [];
	const warnings: string[] = [];
	const { rsi, rse, active } = surfaceResistances(input, notes);
	const rRoofSpace = roofSpaceResistance(input, notes);
	/** resistance outside the last layer that enters RT */
	const rOut = rse + rRoofSpace;
	const layers = modelLayers(input, active, override, warnings, notes);

	const totals = totalResistance(input, layers, active, rsi, rOut, notes, warnings);
	const { combined, rUpper, rLower, rClear } = totals;
	requirePositiveResistance(totals.rTotal);
	const bridged = combined.bridged;
	const relativeError = (rUpper - rLower) / (2 * totals.rTotal);
	if (bridged) bridgingNotes(rUpper, rLower, totals.rTotal, relativeError, notes, warnings);

	// ISO 13370:2017, 8.1: the floor's layers give Rf; the ground adds the rest.
	const floor = input.ground ? groundFloorModel(input.ground, rsi, rse, totals.rTotal, notes) : undefined;
	const rTotal = floor ? floor.rTotal : totals.rTotal;
	const rExternal = floor ? floor.rExternal : rOut;

	const uUncorrected = 1 / rTotal;
	const corrections = elementCorrections(input, layers, active, rTotal, rClear, uUncorrected, notes);

	return {
		rsi,
		rse,
		rExternal,
		...(floor ? { ground: floor.ground } : {}),
		...(input.roofSpace ? { rRoofSpace } : {}),
		layers,
		active,
		combined,
		rTotal,
		rUpper,
		rLower,
		relativeError,
		bridged,
		uUncorrected,
		deltaUAirGaps: corrections.deltaUAirGaps,
		deltaUFasteners: corrections.deltaUFasteners,
		deltaU: corrections.deltaU,
		correctionsApplied: corrections.applied,
		u: corrections.u,
		notes,
		warnings
	};
}

/**
 * Analyse one element: ISO 6946 U-value (unrounded and rounded), interface temperatures and heat
 * flux from the 1-D finite-element solve at the design temperatures, and — with a climate and
 * internal conditions — the ISO 13788 surface check (fRsi against fRsi,min) and the monthly Glaser
 * cycle. Temperatures °C, resistances m²·K/W, U W/(m²·K), flux W/m², amounts g/m².
 * Throws {@link ElementInputError} (from ./schema) naming every invalid field.
 */
export function analyseElement(raw: ElementInput): ElementResult {
	const input = checkedElementInput(raw);
	const tm = buildThermalModel(input);
	const { notes, warnings } = tm;

	const chain = buildHeatChain(tm);
	const { phi, fluxPerKelvin } = solveHeatChain(chain);
	const design = designTemperatures(input, notes);
	const result = baseResult(input, tm, design, temperatureResults(tm, chain, phi, design), fluxPerKelvin);

	if (input.climate === undefined || input.internal === undefined) {
		moistureSkippedNote(input, notes);
		return result;
	}
	const months = monthlyConditions(input.internal, input.climate, notes, warnings);
	const surface = surfaceCheck(tm, months, input.surfaceRsi ?? RSI_SURFACE_CHECK, notes, warnings);
	if (surface) result.surface = surface;
	if (input.ground) groundCondensationNote(notes);
	else
		result.condensation = condensationCheck(
			chain,
			phi,
			months,
			input.moistureLimits ?? {},
			tm.rsi,
			notes,
			warnings
		);
	return result;
}
