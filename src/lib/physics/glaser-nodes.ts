/**
 * The vapour nodes of a Glaser chain (ISO 13788:2012, clause 6): cumulative sd-values, vapour
 * conductances δ0/sd of the elements, and the grouping of heat nodes joined by zero-sd elements
 * into one vapour node each.
 */
import type { GlaserChain, GlaserNode } from './glaser-types';
import { DELTA_0 } from './moisture';
import { zeros } from './glaser-work';

/** The vapour side of a chain: heat nodes 0 … N, vapour nodes 0 … count − 1. */
export interface VapourNodes {
	/** number of elements N (heat nodes 0 … N) */
	elements: number;
	/** cumulative sd from the internal surface at each heat node, m (length N + 1) */
	sdAtHeatNode: number[];
	/**
	 * vapour conductance g = δ0/sd of each element, kg/(m²·s·Pa); Infinity for sd = 0 (the two
	 * nodes are one vapour node). Length N + 1, the last entry unused (0).
	 */
	conductance: number[];
	/** number of vapour nodes */
	count: number;
	/** first heat node of each vapour node */
	first: number[];
	/** last heat node of each vapour node */
	last: number[];
	/** cumulative sd from the internal surface at each vapour node, m */
	sd: number[];
	/** the vapour nodes as reported */
	nodes: GlaserNode[];
}

/**
 * The vapour nodes of `chain` (ISO 13788:2012, clause 6: sd-values in m, vapour permeability of
 * still air δ0 = 2×10⁻¹⁰ kg/(m·s·Pa), so g = δ0/sd in kg/(m²·s·Pa)). Runs of heat nodes joined by
 * zero-sd elements form one vapour node, placed (positionMm) at its outermost member. Throws a
 * RangeError when the total sd is zero (no vapour resistance: the method has no line to draw).
 */
export function vapourNodes(chain: GlaserChain): VapourNodes {
	const n = chain.elements;
	const x = zeros(n + 1);
	const gv = zeros(n + 1);
	for (let e = 0; e < n; e++) {
		const sd = chain.sd[e];
		x[e + 1] = x[e] + sd;
		gv[e] = sd > 0 ? DELTA_0 / sd : Infinity;
	}
	if (!(x[n] > 0)) throw new RangeError('the total sd-value of the element is zero');

	const first: number[] = [0];
	const last: number[] = [];
	for (let e = 0; e < n; e++) {
		if (gv[e] !== Infinity) {
			last.push(e);
			first.push(e + 1);
		}
	}
	last.push(n);
	const count = first.length;

	const nodes: GlaserNode[] = new Array(count);
	const sd = zeros(count);
	for (let g = 0; g < count; g++) {
		const end = last[g];
		sd[g] = x[first[g]];
		nodes[g] = {
			index: g,
			positionMm: chain.positionMm[end],
			positionStartMm: chain.positionMm[first[g]],
			sdM: sd[g],
			layerIndex: chain.layerIndex[end],
			kind: g === 0 ? 'internal-surface' : g === count - 1 ? 'external-surface' : chain.kind[end]
		};
	}
	return { elements: n, sdAtHeatNode: x, conductance: gv, count, first, last, sd, nodes };
}
