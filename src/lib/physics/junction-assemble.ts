/**
 * Assembly of the steady-state conduction system of a junction mesh (ISO 10211 asks for the
 * steady-state heat equation, ∇·(λ∇θ) = 0, in each material, with perfect contact between them).
 * Bilinear quadrilateral elements on the rectangular cells; surface resistances as Robin boundary
 * terms on the exposed edges, h = 1/Rs, edge matrix h·l/6·[[2, 1], [1, 2]] and load h·l·θ/2 at
 * each end; an environment with Rs = 0 fixes the temperature of its edges' nodes (Dirichlet,
 * eliminated into the right-hand side). Per metre of junction length, so lengths enter as ratios
 * in the element matrices and in metres in the edge terms. Temperatures are solved relative to a
 * reference (the coldest environment) so that the tolerance of the iteration applies to the
 * differences that drive the heat flow.
 */
import type { BlockModel } from './junction-geometry';
import { cellRegion, type BoundaryEdges, type Mesh } from './junction-mesh';
import type { Csr } from './junction-sparse';

/** Grid offsets of an element's local nodes 0..3: (i, j), (i+1, j), (i+1, j+1), (i, j+1). */
export const LOCAL_I = [0, 1, 1, 0] as const;
export const LOCAL_J = [0, 0, 1, 1] as const;
const KX = [2, -2, -1, 1, -2, 2, 1, -1, -1, 1, 2, -2, 1, -1, -2, 2];
const KY = [2, 1, -1, -2, 1, 2, -2, -1, -1, -2, 2, 1, -2, -1, 1, 2];

/**
 * Conductance matrix (W/(m·K), 4×4 row-major into `out`) of a bilinear element of conductivity λ on
 * a cell a wide and b high: λ·(b/a)/6·Kx + λ·(a/b)/6·Ky (the exact integral of λ∇Ni·∇Nj).
 */
export function elementMatrix(lambda: number, a: number, b: number, out: Float64Array): void {
	const sx = (lambda * (b / a)) / 6;
	const sy = (lambda * (a / b)) / 6;
	for (let k = 0; k < 16; k++) out[k] = sx * KX[k] + sy * KY[k];
}

/** Which nodes are fixed (Dirichlet), at what temperature, and the numbering of the free ones. */
export interface Constraints {
	/** environment fixing each node, −1 where free */
	fixedEnv: Int32Array;
	/** row of each free node in the system, −1 where fixed */
	freeId: Int32Array;
	freeCount: number;
	/** node of each free row */
	freeNode: Int32Array;
	/** a node on two fixed-temperature boundaries of different temperatures (the first one listed keeps it) */
	fixedConflict: boolean;
}

/** Nodes on edges of fixed-temperature environments (Rs = 0); where two meet, the first boundary keeps the node. */
export function constraints(b: BlockModel, m: Mesh, e: BoundaryEdges): Constraints {
	const fixedEnv = new Int32Array(m.nodeCount).fill(-1);
	let fixedConflict = false;
	for (let k = 0; k < e.count; k++) {
		const env = e.env[k];
		if (b.envRs[env] > 0) continue;
		for (const n of [e.a[k], e.b[k]]) {
			if (fixedEnv[n] < 0) fixedEnv[n] = env;
			else if (b.envTemperature[fixedEnv[n]] !== b.envTemperature[env]) fixedConflict = true;
		}
	}
	const freeId = new Int32Array(m.nodeCount).fill(-1);
	let freeCount = 0;
	for (let n = 0; n < m.nodeCount; n++) if (fixedEnv[n] < 0) freeId[n] = freeCount++;
	const freeNode = new Int32Array(freeCount);
	for (let n = 0; n < m.nodeCount; n++) if (freeId[n] >= 0) freeNode[freeId[n]] = n;
	return { fixedEnv, freeId, freeCount, freeNode, fixedConflict };
}

const cellIsMaterial = (b: BlockModel, m: Mesh, i: number, j: number): boolean =>
	i >= 0 && j >= 0 && i < m.nx && j < m.ny && cellRegion(b, m, i, j) >= 0;

/** Do grid points (i, j) and (i+di, j+dj) share a cell of material? */
function coupled(b: BlockModel, m: Mesh, i: number, j: number, di: number, dj: number): boolean {
	if (di === 0 && dj === 0) return true;
	const ci = i + Math.min(di, 0);
	const cj = j + Math.min(dj, 0);
	if (di !== 0 && dj !== 0) return cellIsMaterial(b, m, ci, cj);
	if (di === 0) return cellIsMaterial(b, m, i - 1, cj) || cellIsMaterial(b, m, i, cj);
	return cellIsMaterial(b, m, ci, j - 1) || cellIsMaterial(b, m, ci, j);
}

/**
 * The CSR pattern of the free rows (up to nine entries: the node and the grid neighbours it shares
 * a cell of material with; columns ascending, as free ids follow the grid order) and `slot`, the
 * entry of each (row, neighbour offset): index row·9 + (dj + 1)·3 + (di + 1), −1 where none.
 */
function pattern(b: BlockModel, m: Mesh, c: Constraints): { a: Csr; slot: Int32Array } {
	const n = c.freeCount;
	const slot = new Int32Array(n * 9).fill(-1);
	const rowPtr = new Int32Array(n + 1);
	const w = m.nx + 1;
	const cols: number[] = [];
	for (let r = 0; r < n; r++) {
		const node = c.freeNode[r];
		const i = m.nodeI[node];
		const j = m.nodeJ[node];
		for (let dj = -1; dj <= 1; dj++)
			for (let di = -1; di <= 1; di++) {
				const gi = i + di;
				const gj = j + dj;
				if (gi < 0 || gj < 0 || gi > m.nx || gj > m.ny) continue;
				const nb = m.node[gj * w + gi];
				if (nb < 0 || c.freeId[nb] < 0 || !coupled(b, m, i, j, di, dj)) continue;
				slot[r * 9 + (dj + 1) * 3 + di + 1] = cols.length;
				cols.push(c.freeId[nb]);
			}
		rowPtr[r + 1] = cols.length;
	}
	return { a: { n, rowPtr, col: Int32Array.from(cols), val: new Float64Array(cols.length) }, slot };
}

export interface System {
	a: Csr;
	/** CSR entry of each (free row, neighbour offset): row·9 + (dj + 1)·3 + (di + 1), −1 where none */
	slot: Int32Array;
	b: Float64Array;
	/** temperature of each node relative to `reference` where fixed (0 where free) */
	fixedValue: Float64Array;
	reference: number;
}

/** Add v·θ(q) to row p: into the matrix where q is free, onto the right-hand side where it is fixed. */
type Scatter = (p: number, q: number, v: number) => void;

function scatterInto(m: Mesh, c: Constraints, s: System, slot: Int32Array): Scatter {
	return (p, q, v) => {
		const rp = c.freeId[p];
		if (rp < 0) return;
		const rq = c.freeId[q];
		if (rq < 0) {
			s.b[rp] -= v * s.fixedValue[q];
			return;
		}
		const di = m.nodeI[q] - m.nodeI[p];
		const dj = m.nodeJ[q] - m.nodeJ[p];
		s.a.val[slot[rp * 9 + (dj + 1) * 3 + di + 1]] += v;
	};
}

/** Element conductances of every cell of material, passed to `add(p, q, v)` entry by entry. */
export function forEachElementEntry(b: BlockModel, m: Mesh, add: Scatter): void {
	const ke = new Float64Array(16);
	const nodes = new Int32Array(4);
	const w = m.nx + 1;
	for (let j = 0; j < m.ny; j++)
		for (let i = 0; i < m.nx; i++) {
			const r = cellRegion(b, m, i, j);
			if (r < 0) continue;
			elementMatrix(b.lambda[r], m.xs[i + 1] - m.xs[i], m.ys[j + 1] - m.ys[j], ke);
			for (let k = 0; k < 4; k++) nodes[k] = m.node[(j + LOCAL_J[k]) * w + i + LOCAL_I[k]];
			for (let p = 0; p < 4; p++) for (let q = 0; q < 4; q++) add(nodes[p], nodes[q], ke[p * 4 + q]);
		}
}

/** Assemble the free rows: conduction, the Robin edges (h = 1/Rs) and the fixed nodes' values. */
export function assemble(
	b: BlockModel,
	m: Mesh,
	e: BoundaryEdges,
	c: Constraints,
	reference: number
): System {
	const { a, slot } = pattern(b, m, c);
	const fixedValue = new Float64Array(m.nodeCount);
	for (let n = 0; n < m.nodeCount; n++)
		if (c.fixedEnv[n] >= 0) fixedValue[n] = b.envTemperature[c.fixedEnv[n]] - reference;
	const s: System = { a, slot, b: new Float64Array(c.freeCount), fixedValue, reference };
	const add = scatterInto(m, c, s, slot);
	forEachElementEntry(b, m, add);
	for (let k = 0; k < e.count; k++) {
		const rs = b.envRs[e.env[k]];
		if (rs === 0) continue;
		const hl = e.lengthMm[k] / 1000 / rs;
		const p = e.a[k];
		const q = e.b[k];
		add(p, p, hl / 3);
		add(q, q, hl / 3);
		add(p, q, hl / 6);
		add(q, p, hl / 6);
		const load = (hl / 2) * (b.envTemperature[e.env[k]] - reference);
		if (c.freeId[p] >= 0) s.b[c.freeId[p]] += load;
		if (c.freeId[q] >= 0) s.b[c.freeId[q]] += load;
	}
	return s;
}
