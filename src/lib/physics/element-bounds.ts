/**
 * The bound of an element input that needs the whole validated element: a total thermal resistance
 * above zero (U would be infinite). Asked of the thermal model's own steps, so that the check and
 * the calculation cannot disagree.
 */
import type { ElementInput } from './schema';
import { effectiveHeatFlow, RSI } from './resistances';
import { R_NEGLIGIBLE, negligibleAsZero } from './bounds';
import { surfaceResistances } from './element-films';
import { roofSpaceResistance } from './element-ground';
import { modelLayers } from './element-layers';
import { totalResistance } from './element-combined';

/**
 * Whether the element's total thermal resistance RT is zero, m²·K/W (ISO 6946:2017: 6.7.2, 6.9.3,
 * 6.9.4), or so small that it is taken as zero (below R_NEGLIGIBLE: e.g. Rsi = 0 and a slightly
 * ventilated air layer of Av just under 1500 mm², whose RT,u weighs almost nothing). RT is never
 * below Rsi (the combined method's limits both include it, and the weighting of a slightly
 * ventilated air layer has weights adding up to 1), so only an element with Rsi = 0 (given, or
 * negligible) is taken through the model: its films, roof space, layers and total.
 */
export function totalResistanceIsZero(input: ElementInput): boolean {
	if (negligibleAsZero(input.rsi ?? RSI[effectiveHeatFlow(input)], R_NEGLIGIBLE) > 0) return false;
	const notes: string[] = [];
	const warnings: string[] = [];
	const { rsi, rse, active } = surfaceResistances(input, notes);
	const rOut = rse + roofSpaceResistance(input, notes);
	const layers = modelLayers(input, active, undefined, warnings, notes);
	return !(totalResistance(input, layers, active, rsi, rOut, notes, warnings).rTotal >= R_NEGLIGIBLE);
}
