/**
 * An element's stored build-up as the layers of a two-dimensional junction model: each layer one
 * homogeneous material of thickness d and conductivity λ, inside to outside, and the element's
 * one-dimensional U from the same layers (ISO 6946: U = 1/(Rsi + Σ d/λ + Rse)), which is the U the
 * flanks of the junction subtract, so that a junction that is no junction has ψ = 0.
 */
import {
	RSE,
	RSI,
	ROOF_SPACE_RESISTANCE,
	unventilatedAirLayerResistance,
	type HeatFlow,
	type Layer,
	type RoofSpace
} from '$lib/physics';
import type { FieldIssue } from '$lib/validation';

/** An element as the builder reads it: its stored build-up and, for a window, its given U. */
export interface BuilderElement {
	id?: string;
	name: string;
	kind: string;
	heatFlow?: HeatFlow;
	layers: Layer[];
	givenU?: number | null;
	groundLambda?: number;
	roofSpace?: RoofSpace;
}

export interface ModelLayer {
	name: string;
	thicknessMm: number;
	lambda: number;
	/** index of the stored layer it stands for */
	stored: number;
}

export interface ModelledElement {
	name: string;
	layers: ModelLayer[];
	thicknessMm: number;
	/** external surface resistance of this element (Rse, or Rsi behind a well-ventilated air layer) */
	rse: number;
	/** Rsi of the element's own heat-flow direction */
	rsi: number;
	/** Σ d/λ of the modelled layers, m²·K/W */
	rLayers: number;
	/** a ceiling's roof space resistance (ISO 6946), m²·K/W; 0 for anything else */
	roofSpaceR: number;
	/** U = 1/(Rsi + Σ d/λ + Rse), W/(m²·K) (a ceiling adds its roof space's resistance) */
	u: number;
	/** index into `layers` of the main insulation: the largest d/λ, unless the person chose one */
	insulation: number;
	notes: string[];
}

/** Layers thinner than this are left out of a junction model (membranes, foils): their R is negligible there. */
export const THIN_LAYER_MM = 1; // this product's choice: below it the mesh would be finer than anything it changes
/** Thickest element a junction model takes, mm (the model's cut-off planes must fit its ±20 m). */
export const ELEMENT_THICKNESS_MAX_MM = 3000;

type LayerOutcome = { layer?: ModelLayer; note?: string; issue?: string; stop?: true };

/** One stored layer as a homogeneous model layer, or why it is left out, or where the model stops. */
function modelLayer(l: Layer, i: number, heatFlow: HeatFlow): LayerOutcome {
	const name = l.name || `layer ${i + 1}`;
	if (l.air === 'well-ventilated') return { stop: true };
	if (!(l.thicknessMm >= THIN_LAYER_MM))
		return { note: `“${name}” (${l.thicknessMm} mm) is thinner than ${THIN_LAYER_MM} mm and is left out.` };
	const d = l.thicknessMm;
	if (l.air) {
		if (d > 300) return { issue: `is an air layer over 300 mm, which ISO 6946's table does not cover` };
		const r = unventilatedAirLayerResistance(d, heatFlow);
		const note = `Air layer “${name}” as a material of equivalent λ = d/R = ${(d / 1000 / r).toFixed(3)} W/(m·K) (R = ${r.toFixed(2)} m²·K/W, ISO 6946 Table 8 for ${heatFlow} heat flow, as the element takes it${l.air === 'slightly-ventilated' ? '; slightly ventilated taken as unventilated' : ''}).`;
		return { layer: { name, thicknessMm: d, lambda: d / 1000 / r, stored: i }, note };
	}
	if (typeof l.lambda === 'number' && l.lambda > 0) {
		const note = l.bridge
			? `Bridged layer “${name}” taken at the λ of its main material (${l.lambda} W/(m·K)); the bridging (λ ${l.bridge.lambda}) is not modelled in two dimensions.`
			: l.fasteners
				? `The fasteners of “${name}” are not modelled.`
				: undefined;
		return { layer: { name, thicknessMm: d, lambda: l.lambda, stored: i }, note };
	}
	if (typeof l.resistance === 'number' && l.resistance > 0)
		return {
			layer: { name, thicknessMm: d, lambda: d / 1000 / l.resistance, stored: i },
			note: `“${name}”, given by its resistance ${l.resistance} m²·K/W, as a material of λ = d/R = ${(d / 1000 / l.resistance).toFixed(4)} W/(m·K).`
		};
	return { note: `“${name}” has no λ and no resistance above zero and is left out.` };
}

/**
 * The model layers of an element (inside to outside), its U from them, and the notes that say what
 * was simplified; issues (with `path`) when the element cannot be modelled.
 */
export function modelElement(
	el: BuilderElement,
	path: string,
	options: { heatFlow?: HeatFlow; insulationLayer?: number } = {}
): { ok: true; element: ModelledElement } | { ok: false; issues: FieldIssue[] } {
	const heatFlow = options.heatFlow ?? el.heatFlow ?? 'horizontal';
	const layers: ModelLayer[] = [];
	const notes: string[] = [];
	const issues: FieldIssue[] = [];
	let rse = RSE;
	for (const [i, l] of el.layers.entries()) {
		const out = modelLayer(l, i, heatFlow);
		if (out.stop) {
			rse = RSI[heatFlow];
			notes.push(
				`“${el.name}”: the well-ventilated air layer and the layers outside it are left out, and the surface behind it takes Rse = Rsi = ${rse} m²·K/W (ISO 6946, 6.9.4).`
			);
			break;
		}
		if (out.issue)
			issues.push({ path: `${path}.layers.${i}`, message: `“${el.name}” layer ${i + 1} ${out.issue}` });
		if (out.note) notes.push(`“${el.name}”: ${out.note}`);
		if (out.layer) layers.push(out.layer);
	}
	if (!layers.length && !issues.length)
		issues.push({
			path,
			message: `“${el.name}” has no layer a junction model can use (each needs a thickness of ${THIN_LAYER_MM} mm or more and a λ or a resistance)`
		});
	const thicknessMm = layers.reduce((s, l) => s + l.thicknessMm, 0);
	if (thicknessMm > ELEMENT_THICKNESS_MAX_MM)
		issues.push({
			path,
			message: `“${el.name}” is ${thicknessMm} mm thick; a junction model takes elements up to ${ELEMENT_THICKNESS_MAX_MM} mm`
		});
	if (issues.length) return { ok: false, issues };
	const rLayers = layers.reduce((s, l) => s + l.thicknessMm / 1000 / l.lambda, 0);
	const ru = el.roofSpace ? ROOF_SPACE_RESISTANCE[el.roofSpace] : 0;
	const rsi = RSI[heatFlow];
	const chosen = options.insulationLayer;
	const byChoice = chosen === undefined ? -1 : layers.findIndex((l) => l.stored === chosen);
	return {
		ok: true,
		element: {
			name: el.name,
			layers,
			thicknessMm,
			rse,
			rsi,
			rLayers,
			roofSpaceR: ru,
			u: 1 / (rsi + rLayers + ru + rse),
			insulation: byChoice >= 0 ? byChoice : largestResistance(layers),
			notes
		}
	};
}

/** Index of the layer of the largest d/λ (the first of equals). */
function largestResistance(layers: ModelLayer[]): number {
	let best = 0;
	layers.forEach((l, i) => {
		if (l.thicknessMm / l.lambda > layers[best].thicknessMm / layers[best].lambda) best = i;
	});
	return best;
}

/** Depth (mm) from the inside face to the inside and outside faces of layer `i`. */
export function layerDepth(e: ModelledElement, i: number): [number, number] {
	const from = e.layers.slice(0, i).reduce((s, l) => s + l.thicknessMm, 0);
	return [from, from + e.layers[i].thicknessMm];
}
