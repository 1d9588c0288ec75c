/**
 * The element as a chain of one-dimensional finite elements for the temperature solve: the Rsi
 * film, every layer that counts split into sublayers of R ≤ 0.25 m²·K/W (ISO 13788:2012, 6.2; the
 * same nodes serve the Glaser check) up to a cap per layer, and the external resistance.
 */
import type { ThermalModel } from './element-model';
import type { NodeKind } from './glaser';
import { solveSeries } from './series';
import { R_NEGLIGIBLE } from './bounds';
import { fmt } from './note-format';

/** Largest resistance of one sublayer in the Glaser calculation, m²·K/W. */
export const GLASER_SUBLAYER_MAX_R = 0.25; // ISO 13788:2012, 6.2 (layers of R > 0.25 are divided)

/**
 * Most sublayers of one layer. The standard's rule holds up to R = 25 m²·K/W per layer (a metre of
 * insulation of λ 0.04); above, the layer's sublayers are larger than 0.25 m²·K/W, with a note.
 * With the bounds of the input (./bounds) the chain has at most 900 sublayers however large the
 * resistances, so the solve and the Glaser cycle stay within a small time and memory.
 */
export const GLASER_SUBLAYERS_MAX = 100; // this product's cap, no source (ISO 13788:2012, 6.2 sets no cap)

/** Conductance of a chain element of resistance `r`, W/(m²·K): a negligible (or zero) one is joined. */
const conductance = (r: number): number => (r >= R_NEGLIGIBLE ? 1 / r : Infinity);

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
 * layer's sublayers (its path resistance split in ⌈R/0.25⌉ equal parts, ISO 13788:2012, 6.2, at
 * most {@link GLASER_SUBLAYERS_MAX}, noted in `tm.notes` when the cap applies) and of the external
 * resistance, a resistance below R_NEGLIGIBLE joining its nodes; node positions (mm), layers and
 * kinds; each sublayer's sd (m).
 */
export function buildHeatChain(tm: ThermalModel): HeatChain {
	const { layers, active, rsi } = tm;
	const splits: number[] = new Array(active);
	let nElem = 2;
	for (let i = 0; i < active; i++) {
		const standard = Math.max(1, Math.ceil(layers[i].rPath / GLASER_SUBLAYER_MAX_R - 1e-9));
		splits[i] = Math.min(standard, GLASER_SUBLAYERS_MAX);
		if (standard > GLASER_SUBLAYERS_MAX) {
			const l = layers[i];
			tm.notes.push(
				`Layer ${i + 1} (${l.layer.name}): R = ${fmt(l.rPath)} m²·K/W is split into ${GLASER_SUBLAYERS_MAX} sublayers of ${fmt(l.rPath / GLASER_SUBLAYERS_MAX)} m²·K/W for the temperature profile and the Glaser check, not the ${standard} of at most ${GLASER_SUBLAYER_MAX_R} m²·K/W of ISO 13788:2012, 6.2 (at most ${GLASER_SUBLAYERS_MAX} per layer).`
			);
		}
		nElem += splits[i];
	}
	const g: number[] = new Array(nElem);
	const positionMm: number[] = new Array(nElem + 1);
	const layerIndex: number[] = new Array(nElem + 1);
	const kind: NodeKind[] = new Array(nElem + 1);
	const sd: number[] = new Array(nElem);
	const endNode: number[] = new Array(active);
	g[0] = conductance(rsi);
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
			g[e] = conductance(rSub);
			sd[e] = sdSub;
			positionMm[e + 1] = m.startMm + ((m.endMm - m.startMm) * (s + 1)) / k;
			layerIndex[e + 1] = i;
			kind[e + 1] = s === k - 1 ? 'interface' : 'sublayer';
			e++;
		}
		endNode[i] = e;
	}
	g[e] = conductance(tm.rExternal);
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
