/**
 * The vapour-pressure line of one month over the cumulative sd (ISO 13788:2012, clause 6): from pi
 * to pe, never above the saturation pressures, held at psat where an interface is still wet, and
 * drawn taut (the lower convex hull of the points between fixed nodes). The nodes it touches are
 * the condensation interfaces of the month. The line is given by its vertices: the fixed and
 * touching vapour nodes in order, with their pressures (work.vertex, work.vertexPressure).
 */
import type { GlaserMonth } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import type { GlaserWork } from './glaser-work';

/**
 * The straight line from pi (internal surface) to pe (external surface), Pa: the line of a month
 * with nothing wet and nothing touching (ISO 13788:2012, clause 6). Returns the number of vertices, 2.
 */
export function straightLine(vn: VapourNodes, month: GlaserMonth, work: GlaserWork): number {
	work.vertex[0] = 0;
	work.vertexPressure[0] = month.internalVapourPressure;
	work.vertex[1] = vn.count - 1;
	work.vertexPressure[1] = month.externalVapourPressure;
	return 2;
}

/**
 * The lower convex hull (monotone chain) of the points (sd[k], y[k]) for k = a … b, m and Pa (the
 * taut line under psat of ISO 13788:2012, clause 6, as a geometric construction):
 * leaves the hull's nodes a … b in `stack` and returns their number. A point is kept only if it
 * lies below the chord of its neighbours by more than a round-off margin; the test is written
 * without division: (y_mid − y_o)(x_k − x_o) < (y_k − y_o)(x_mid − x_o).
 */
export function lowerHull(
	sd: readonly number[],
	y: readonly number[],
	a: number,
	b: number,
	stack: number[]
): number {
	let sp = 0;
	stack[sp++] = a;
	for (let k = a + 1; k <= b; k++) {
		const yk = y[k];
		const xk = sd[k];
		while (sp >= 2) {
			const o = stack[sp - 2];
			const mid = stack[sp - 1];
			const xo = sd[o];
			const yo = y[o];
			const ym = y[mid];
			const span = xk - xo;
			if ((ym - yo) * span >= (yk - yo) * (sd[mid] - xo) - 1e-9 * (Math.abs(ym) + 1) * span) sp--;
			else break;
		}
		stack[sp++] = k;
	}
	return sp;
}

/**
 * The taut line of a month (ISO 13788:2012, clause 6), pressures Pa over sd m: pi and pe at the
 * surfaces, and, when `holdWet`, every interior vapour node with an amount held (work.amount > 0)
 * fixed at its saturation pressure `psat` (an interface still wet from earlier months: its
 * pressure is psat, and it evaporates where the line bends the other way). Between fixed nodes the
 * line is the lower hull under psat, so it touches psat at the condensation interfaces. Fills
 * work.vertex / work.vertexPressure and returns the number of vertices.
 */
export function tautLine(
	vn: VapourNodes,
	month: GlaserMonth,
	psat: readonly number[],
	holdWet: boolean,
	work: GlaserWork
): number {
	const { vertex, vertexPressure, stack, ceiling: y, amount } = work;
	const last = vn.count - 1;
	let nv = 0;
	vertex[nv] = 0;
	vertexPressure[nv] = month.internalVapourPressure;
	nv++;
	y[0] = month.internalVapourPressure;
	for (let g = 1; g < last; g++) y[g] = psat[g];
	y[last] = month.externalVapourPressure;
	let a = 0;
	for (let b = 1; b <= last; b++) {
		if (b < last && !(holdWet && amount[b] > 0)) continue;
		const sp = lowerHull(vn.sd, y, a, b, stack);
		for (let q = 1; q < sp; q++) {
			const v = stack[q];
			vertex[nv] = v;
			vertexPressure[nv] = y[v];
			nv++;
		}
		a = b;
	}
	return nv;
}
