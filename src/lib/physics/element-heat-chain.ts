/**
 * The element as a chain of one-dimensional finite elements for the temperature solve: the Rsi
 * film, every layer that counts split into sublayers of R ≤ 0.25 m²·K/W (ISO 13788:2012, 6.2; the
 * same nodes serve the Glaser check), and the external resistance.
 */
import type { ThermalModel } from './element-model';
import type { NodeKind } from './glaser';
import { solveSeries } from './series';

/** Largest resistance of one sublayer in the Glaser calculation, m²·K/W. */
export const GLASER_SUBLAYER_MAX_R = 0.25; // ISO 13788:2012, 6.2 (layers of R > 0.25 are divided)

/**
 * Elements 0 … n − 1 join nodes 0 … n. Element 0 is the Rsi film (nodes 0 and 1 both lie on the
 * internal surface), element n − 1 the external resistance (nodes n − 1 and n on the external surface).
 * Plain arrays: small typed arrays are costly to allocate, and this runs on every keystroke.
 */
export interface HeatChain {
	/** number of elements n */
	elements: number;
	/** conductance of each element, W/(m²·K); Infinity for a zero resistance */
	g: number[];
	/** sd-value of each sublayer element, m (the two film elements are left empty) */
	sd: number[];
	/** position of each node from the internal surface, mm */
	positionMm: number[];
	/** index of the layer a node ends (−1 on the internal surface) */
	layerIndex: number[];
	kind: NodeKind[];
	/** node that ends each layer that counts */
	endNode: number[];
}

/**
 * The heat chain of a thermal model: conductances g = 1/R (W/(m²·K)) of the Rsi film, of each
 * layer's sublayers (its path resistance split in ⌈R/0.25⌉ equal parts, ISO 13788:2012, 6.2) and of
 * the external resistance; node positions (mm), layers and kinds; each sublayer's sd (m).
 */
export function buildHeatChain(tm: ThermalModel): HeatChain {
	const { layers, active, rsi } = tm;
	const splits: number[] = new Array(active);
	let nElem = 2;
	for (let i = 0; i < active; i++) {
		splits[i] = Math.max(1, Math.ceil(layers[i].rPath / GLASER_SUBLAYER_MAX_R - 1e-9));
		nElem += splits[i];
	}
	const g: number[] = new Array(nElem);
	const positionMm: number[] = new Array(nElem + 1);
	const layerIndex: number[] = new Array(nElem + 1);
	const kind: NodeKind[] = new Array(nElem + 1);
	const sd: number[] = new Array(nElem);
	const endNode: number[] = new Array(active);
	g[0] = rsi > 0 ? 1 / rsi : Infinity;
	positionMm[0] = 0;
	layerIndex[0] = -1;
	kind[0] = 'internal-surface';
	positionMm[1] = 0;
	layerIndex[1] = -1;
	kind[1] = 'internal-surface';
	let e = 1;
	for (let i = 0; i < active; i++) {
		const m = layers[i];
		const k = splits[i];
		const rSub = m.rPath / k;
		const sdSub = (m.sd ?? 0) / k;
		for (let s = 0; s < k; s++) {
			g[e] = rSub > 0 ? 1 / rSub : Infinity;
			sd[e] = sdSub;
			positionMm[e + 1] = m.startMm + ((m.endMm - m.startMm) * (s + 1)) / k;
			layerIndex[e + 1] = i;
			kind[e + 1] = s === k - 1 ? 'interface' : 'sublayer';
			e++;
		}
		endNode[i] = e;
	}
	g[e] = tm.rExternal > 0 ? 1 / tm.rExternal : Infinity;
	positionMm[e + 1] = positionMm[e];
	layerIndex[e + 1] = active - 1;
	kind[e] = 'external-surface';
	kind[e + 1] = 'external-surface';
	return { elements: nElem, g, sd, positionMm, layerIndex, kind, endNode };
}

/**
 * Steady conduction through the chain by the finite-element kernel, made dimensionless:
 * φ = (θ − θe)/(θi − θe) at every node (1 at the internal air, 0 at the external air), and the
 * heat flux per kelvin of θi − θe, W/(m²·K).
 */
export function solveHeatChain(chain: HeatChain): { phi: number[]; fluxPerKelvin: number } {
	const phi: number[] = new Array(chain.elements + 1);
	const fluxPerKelvin = solveSeries(chain.g, 0, chain.elements, 1, 0, phi);
	return { phi, fluxPerKelvin };
}
