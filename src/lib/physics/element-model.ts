/**
 * The ISO 6946 thermal model of an element: what `buildThermalModel` returns, the U-value and the
 * inverse solve need, and the temperature profile and moisture checks start from. Types only.
 */
import type { ElementResult, Layer, LayerResult } from './schema';
import type { CombinedResult } from './bridging';

/** Layer as the thermal model sees it. */
export interface LayerModel {
	index: number;
	layer: Layer;
	kind: LayerResult['kind'];
	startMm: number;
	endMm: number;
	disregarded: boolean;
	/** resistance of the layer or its main material, m²·K/W */
	r: number;
	rBridge?: number;
	fraction?: number;
	rEquivalent: number;
	/** resistance along the profile and moisture path, m²·K/W */
	rPath: number;
	/** m, or null when unknown */
	sd: number | null;
}

/** The thermal part of an analysis (no profile, no moisture): what U and the inverse need. */
export interface ThermalModel {
	rsi: number;
	rse: number;
	/** resistance between the last active layer and the external air: Rse, plus a roof space or the ground's equivalent resistance, m²·K/W */
	rExternal: number;
	/** ground floors: RT and U of the build-up alone, and the ISO 13370 figures */
	ground?: NonNullable<ElementResult['ground']> & { rBuildUp: number; uBuildUp: number };
	/** roof-space resistance included in RT, m²·K/W */
	rRoofSpace?: number;
	layers: LayerModel[];
	/** number of layers inside a well-ventilated air layer (all layers when there is none) */
	active: number;
	combined: CombinedResult;
	rTotal: number;
	rUpper: number;
	rLower: number;
	relativeError: number;
	bridged: boolean;
	uUncorrected: number;
	deltaUAirGaps: number;
	deltaUFasteners: number;
	deltaU: number;
	correctionsApplied: boolean;
	u: number;
	notes: string[];
	warnings: string[];
}
