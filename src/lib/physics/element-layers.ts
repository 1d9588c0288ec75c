/**
 * The layers of an element as the thermal model sees them: kind, thermal resistance (ISO 6946:2017,
 * 6.7.1; air layers 6.9.2, Table 8), the bridge of a bridged layer for the combined method (6.7.2),
 * position, and sd-value (ISO 13788:2012, 3.1).
 */
import type { ElementInput, Layer, LayerResult } from './schema';
import type { LayerModel } from './element-model';
import {
	effectiveHeatFlow,
	layerResistance,
	unventilatedAirLayerResistance,
	type HeatFlow
} from './resistances';
import { bridgeFraction } from './bridging';
import { vapourThickness } from './moisture';
import { R_NEGLIGIBLE, SD_NEGLIGIBLE } from './bounds';

/** Bridging conductivity from which a bridge is taken to be metal, W/(m·K). */
const METAL_LAMBDA = 10; // common practice, no source: metals lie far above, other building materials below

/**
 * Kind of a layer: a homogeneous material with λ (ISO 6946:2017, 6.7.1), a given thermal
 * resistance, or an air layer by its ventilation (unventilated 6.9.2, slightly 6.9.3, well 6.9.4).
 */
export function layerKind(l: Layer): LayerResult['kind'] {
	if (l.air === 'well-ventilated') return 'air-well-ventilated';
	if (l.air) return l.air === 'unventilated' ? 'air-unventilated' : 'air-slightly-ventilated';
	return l.resistance !== undefined ? 'resistance' : 'material';
}

/**
 * Thermal resistance of a layer `d` mm thick, m²·K/W: R = d/λ (ISO 6946:2017, 6.7.1) or R as given;
 * an unventilated or slightly ventilated air layer from Table 8 (6.9.2) unless its R is given; a
 * well-ventilated air layer 0 (it is disregarded, 6.9.4). A bridged layer: its main material.
 */
export function layerThermalResistance(l: Layer, d: number, heatFlow: HeatFlow): number {
	if (l.air === 'well-ventilated') return 0;
	if (l.air) return l.resistance ?? unventilatedAirLayerResistance(d, heatFlow);
	if (l.resistance !== undefined) return l.resistance;
	return layerResistance(d, l.lambda as number);
}

/**
 * sd-value of a layer `d` mm thick, m (ISO 13788:2012, 3.1: sd = μ·d; an air layer μ = 1), or null
 * without vapour data. A given sd is scaled with the thickness when that is overridden. A bridged
 * layer with a bridge μ takes the parallel vapour paths: 1/sd = (1 − f)/sd_main + f/sd_bridge.
 */
export function layerVapourThickness(
	l: Layer,
	d: number,
	thicknessOverridden: boolean,
	fraction: number | undefined
): number | null {
	let sd: number | null =
		l.sd ?? (l.mu !== undefined ? vapourThickness(l.mu, d) : l.air ? vapourThickness(1, d) : null);
	if (sd !== null && l.sd !== undefined && thicknessOverridden) sd = (l.sd * d) / l.thicknessMm;
	if (sd !== null && fraction !== undefined && l.bridge?.mu !== undefined) {
		const sdB = vapourThickness(l.bridge.mu, d);
		sd = sd === 0 || sdB === 0 ? 0 : 1 / ((1 - fraction) / sd + fraction / sdB);
	}
	return sd;
}

/** A figure too small for the notes' decimals, e.g. 1.0e-17. */
const tiny = (v: number): string => v.toExponential(1);

/**
 * Every layer of the element, inside to outside, with its kind, resistances (m²·K/W), position
 * (mm) and sd-value (m). Only the first `active` layers are bridged (the rest are disregarded);
 * `override` replaces the thickness of one layer. Path and equivalent resistances start as R; the
 * combined method sets them. Warns of λ given for an air layer and of bridges of metal. A
 * resistance below {@link R_NEGLIGIBLE} (of the layer or its bridge) and an sd-value below
 * {@link SD_NEGLIGIBLE} are taken as zero, with a note: they change nothing that can be reported,
 * and a conductance of 10¹⁶ beside one of 10 leaves the solve no digits.
 */
export function modelLayers(
	input: ElementInput,
	active: number,
	override: { index: number; thicknessMm: number } | undefined,
	warnings: string[],
	notes: string[]
): LayerModel[] {
	const layers: LayerModel[] = new Array(input.layers.length);
	const heatFlow = effectiveHeatFlow(input);
	let pos = 0;
	for (let i = 0; i < input.layers.length; i++) {
		const l = input.layers[i];
		const overridden = override !== undefined && override.index === i;
		const d = overridden ? override.thicknessMm : l.thicknessMm;
		const kind = layerKind(l);
		let r = layerThermalResistance(l, d, heatFlow);
		if (r > 0 && r < R_NEGLIGIBLE) {
			notes.push(
				`Layer ${i + 1} (${l.name}): R = ${tiny(r)} m²·K/W is below ${R_NEGLIGIBLE} m²·K/W and is taken as zero.`
			);
			r = 0;
		}
		if (l.air && l.air !== 'well-ventilated' && l.lambda !== undefined)
			warnings.push(
				`Layer ${i + 1} (${l.name}): λ is ignored for an air layer; its resistance comes from ISO 6946.`
			);
		let rBridge: number | undefined;
		let fraction: number | undefined;
		if (l.bridge && i < active) {
			rBridge = layerResistance(d, l.bridge.lambda);
			if (rBridge > 0 && rBridge < R_NEGLIGIBLE) {
				notes.push(
					`Layer ${i + 1} (${l.name}): the bridging material's R = ${tiny(rBridge)} m²·K/W is below ${R_NEGLIGIBLE} m²·K/W and is taken as zero.`
				);
				rBridge = 0;
			}
			fraction =
				l.bridge.fraction ?? bridgeFraction(l.bridge.widthMm as number, l.bridge.centresMm as number);
			if (l.bridge.lambda >= METAL_LAMBDA) {
				warnings.push(
					`Layer ${i + 1} (${l.name}) is bridged by a material of λ = ${l.bridge.lambda} W/(m·K) (metal): the ISO 6946 combined method is not meant for insulation bridged by metal; use a numerical calculation (ISO 10211).`
				);
			}
		}
		let sd = layerVapourThickness(l, d, overridden, fraction);
		if (sd !== null && sd > 0 && sd < SD_NEGLIGIBLE) {
			notes.push(
				`Layer ${i + 1} (${l.name}): sd = ${tiny(sd)} m is below ${SD_NEGLIGIBLE} m and is taken as zero (vapour-open).`
			);
			sd = 0;
		}
		layers[i] = {
			index: i,
			layer: l,
			kind,
			startMm: pos,
			endMm: pos + d,
			disregarded: i >= active,
			r,
			rBridge,
			fraction,
			rEquivalent: r,
			rPath: r,
			sd
		};
		pos += d;
	}
	return layers;
}
