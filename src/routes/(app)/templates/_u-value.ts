import { analyseElement, parseElementInput } from '$lib/physics';
import { DEFAULT_HEAT_FLOW, type ElementKind } from '$lib/dwellings/kinds';
import { type StoredBuildUp as BuildUp } from '$lib/dwellings/element-input';

/**
 * The template's U-value with the standard surface resistances for its kind's heat-flow direction, before
 * any climate or internal conditions: a guide for choosing, not a result for a dwelling.
 */
export function templateU(kind: ElementKind, buildUp: BuildUp) {
	const parsed = parseElementInput({
		heatFlow: DEFAULT_HEAT_FLOW[kind],
		rsi: buildUp.rsi,
		rse: buildUp.rse,
		layers: buildUp.layers
	});
	if (!parsed.ok)
		return {
			u: null,
			rounded: null,
			problem: parsed.issues.map((i) => `${i.path}: ${i.message}`).join('; ')
		};
	try {
		const r = analyseElement(parsed.data);
		return { u: r.uValue, rounded: r.uValueRounded, problem: null };
	} catch (e) {
		return { u: null, rounded: null, problem: e instanceof Error ? e.message : 'cannot be calculated' };
	}
}
