/**
 * The heat storage of an element as entered: its build-up handed to the ISO 13786 calculation
 * (src/lib/physics/dynamic.ts) with the surface resistances and layer resistances of its own result, so
 * that the dynamic figures and the U-value describe the same element. Pure; the page and the report call
 * it alike.
 */
import type { ElementResult } from '$lib/physics';
import { analyseDynamic, DYNAMIC_PERIOD_DEFAULT_H, type DynamicResult } from '$lib/physics/dynamic';
import type { StoredBuildUp } from './element-input';

export type ElementDynamics = { ok: true; value: DynamicResult } | { ok: false; reason: string };

/**
 * The dynamic thermal characteristics for a 24-hour period, or why they cannot be given: a bridged
 * layer (the method takes homogeneous layers), a layer without density or specific heat, a floor on the
 * ground (the ground's own storage is not in a build-up's matrix). Layers outside a well-ventilated air
 * layer are left out as they are for the U-value, and the external resistance is then the element's.
 */
export function elementDynamics(buildUp: StoredBuildUp, result: ElementResult): ElementDynamics {
	if (result.ground) return { ok: false, reason: 'not given for a floor on the ground' };
	const layers: Record<string, unknown>[] = [];
	const missing: number[] = [];
	for (const [i, l] of buildUp.layers.entries()) {
		const r = result.layers[i];
		if (!r || r.disregarded) continue;
		if (l.bridge)
			return {
				ok: false,
				reason: `layer ${i + 1} is bridged, and the method takes homogeneous layers only`
			};
		if (l.air || l.lambda === undefined) {
			// an air layer or a resistance: no heat capacity, its resistance as the U-value takes it
			layers.push({ name: l.name, resistance: r.r });
			continue;
		}
		if (l.density === undefined || l.specificHeat === undefined) {
			missing.push(i + 1);
			continue;
		}
		layers.push({
			name: l.name,
			thicknessMm: l.thicknessMm,
			lambda: l.lambda,
			density: l.density,
			specificHeat: l.specificHeat
		});
	}
	if (missing.length)
		return {
			ok: false,
			reason: `give the density and specific heat of layer${missing.length > 1 ? 's' : ''} ${missing.join(', ')} (layer details)`
		};
	try {
		return {
			ok: true,
			value: analyseDynamic({ layers, rsi: result.rsi, rse: result.rse, periodH: DYNAMIC_PERIOD_DEFAULT_H })
		};
	} catch (e) {
		return { ok: false, reason: (e as Error).message };
	}
}
