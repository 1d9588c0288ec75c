/**
 * What follows from the solved temperatures of a junction mesh: the heat flow from each
 * environment (ISO 10211: Φ in W/m), the coupling coefficient L2D, the temperature factor fRsi and
 * the coldest surface point, temperatures at probe points, and the previous mesh's field carried
 * onto the next one (the starting guess of its solve).
 */
import { candidates, type BlockModel } from './junction-geometry';
import { cellRegion, type BoundaryEdges, type Mesh } from './junction-mesh';
import { forEachElementEntry, type Constraints } from './junction-assemble';
import { coarseCellOf } from './junction-multigrid';

/**
 * Heat flow (W/m) entering the model from each environment. Through an edge with Rs > 0 it is
 * h·∫(θenv − θ)ds over the edge (θ linear along it); into a fixed-temperature environment's nodes
 * it is their reaction, the residual (K·θ − f) of their rows of the full system. Both are exact
 * consequences of the discrete equations, so the flows balance to the solver's tolerance.
 * `rel` holds temperatures relative to `reference`.
 */
export function heatFlows(
	b: BlockModel,
	m: Mesh,
	e: BoundaryEdges,
	c: Constraints,
	rel: Float64Array,
	reference: number
): Float64Array {
	const flow = new Float64Array(b.envNames.length);
	const reaction = new Float64Array(m.nodeCount);
	forEachElementEntry(b, m, (p, q, v) => {
		if (c.fixedEnv[p] >= 0) reaction[p] += v * rel[q];
	});
	for (let k = 0; k < e.count; k++) {
		const rs = b.envRs[e.env[k]];
		if (rs === 0) continue;
		const hl = e.lengthMm[k] / 1000 / rs;
		const te = b.envTemperature[e.env[k]] - reference;
		const p = e.a[k];
		const q = e.b[k];
		flow[e.env[k]] += hl * (te - (rel[p] + rel[q]) / 2);
		reaction[p] += hl * (rel[p] / 3 + rel[q] / 6 - te / 2);
		reaction[q] += hl * (rel[q] / 3 + rel[p] / 6 - te / 2);
	}
	for (let n = 0; n < m.nodeCount; n++) if (c.fixedEnv[n] >= 0) flow[c.fixedEnv[n]] += reaction[n];
	return flow;
}

/** Environments that the boundaries face, grouped: warmest and coldest temperature, and how many temperatures. */
export function temperatureGroups(b: BlockModel): {
	warm: number;
	cold: number;
	distinct: number;
	used: boolean[];
} {
	const used = b.envNames.map(() => false);
	for (const s of b.segments) used[s.env] = true;
	const temps = [...new Set(b.envNames.flatMap((_, i) => (used[i] ? [b.envTemperature[i]] : [])))];
	return { warm: Math.max(...temps), cold: Math.min(...temps), distinct: temps.length, used };
}

/**
 * L2D, W/(m·K) (ISO 10211): the heat flow between the two environments over their temperature
 * difference; the mean of the flow into the warm side and out of the cold side, which agree to the
 * solver's tolerance. With more than two temperatures, the flow from the warmest environments over
 * the difference between the warmest and the coldest (a caution says so).
 */
export function couplingCoefficient(b: BlockModel, flow: Float64Array): number {
	const g = temperatureGroups(b);
	let warm = 0;
	let cold = 0;
	b.envNames.forEach((_, i) => {
		if (!g.used[i]) return;
		if (b.envTemperature[i] === g.warm) warm += flow[i];
		else if (b.envTemperature[i] === g.cold) cold += flow[i];
	});
	const dt = g.warm - g.cold;
	return g.distinct === 2 ? (warm - cold) / 2 / dt : warm / dt;
}

/**
 * The coldest node on the edges of the warmest environments, and fRsi = (θsi,min − θe)/(θi − θe)
 * (ISO 10211, ISO 13788), θi the warmest and θe the coldest environment's temperature. The field is
 * linear along an edge, so its lowest value on the surface is at a node.
 */
export function surfaceMinimum(b: BlockModel, m: Mesh, e: BoundaryEdges, temperature: Float64Array) {
	const g = temperatureGroups(b);
	let best = -1;
	for (let k = 0; k < e.count; k++) {
		if (b.envTemperature[e.env[k]] !== g.warm) continue;
		for (const n of [e.a[k], e.b[k]]) if (best < 0 || temperature[n] < temperature[best]) best = n;
	}
	const t = temperature[best];
	return {
		fRsi: (t - g.cold) / (g.warm - g.cold),
		coldest: { x: m.xs[m.nodeI[best]], y: m.ys[m.nodeJ[best]], temperature: t }
	};
}

/** Bilinear interpolation of node values `v` in cell (ci, cj) at (x, y). */
function inCell(m: Mesh, v: Float64Array, ci: number, cj: number, x: number, y: number): number {
	const w = m.nx + 1;
	const s = (x - m.xs[ci]) / (m.xs[ci + 1] - m.xs[ci]);
	const t = (y - m.ys[cj]) / (m.ys[cj + 1] - m.ys[cj]);
	const n00 = m.node[cj * w + ci];
	const n10 = m.node[cj * w + ci + 1];
	const n11 = m.node[(cj + 1) * w + ci + 1];
	const n01 = m.node[(cj + 1) * w + ci];
	return (1 - s) * (1 - t) * v[n00] + s * (1 - t) * v[n10] + s * t * v[n11] + (1 - s) * t * v[n01];
}

/** The field at a point of the material, interpolated in the element that holds it (NaN outside). */
export function valueAt(b: BlockModel, m: Mesh, v: Float64Array, x: number, y: number): number {
	for (const cj of candidates(m.ys, y))
		for (const ci of candidates(m.xs, x))
			if (cellRegion(b, m, ci, cj) >= 0) return inCell(m, v, ci, cj, x, y);
	return NaN;
}

/**
 * A coarser mesh's field on the free nodes of the next (nested) mesh: fine grid line 2k is coarse
 * line k, so each fine point lies in (or on the edge of) a known coarse cell of material.
 */
export function prolong(
	b: BlockModel,
	coarse: Mesh,
	v: Float64Array,
	fine: Mesh,
	c: Constraints,
	out: Float64Array
) {
	const ci = new Int32Array(2);
	const cj = new Int32Array(2);
	for (let r = 0; r < c.freeCount; r++) {
		const n = c.freeNode[r];
		const i = fine.nodeI[n];
		const j = fine.nodeJ[n];
		const cell = coarseCellOf(b, coarse, i, j, ci, cj);
		out[r] = cell ? inCell(coarse, v, cell[0], cell[1], fine.xs[i], fine.ys[j]) : 0;
	}
}
