/**
 * Geometric multigrid V-cycle as the preconditioner of conjugate gradients, on the nested meshes of
 * the refinement. Bilinear elements on nested rectilinear meshes give nested spaces: a coarse
 * function is bilinear on every fine cell (each fine cell lies in one coarse cell of the same
 * material), so the matrix assembled on the coarse mesh equals Pᵀ·A·P, P the bilinear
 * interpolation from coarse to fine free nodes (fixed nodes carry no correction on either mesh).
 * Zebra line Gauss–Seidel smoothing along x and y (each line's tridiagonal system solved exactly,
 * so thin layers and stretched cells do not slow it), in reverse order after the coarse correction,
 * and an exact banded Cholesky solve on the coarsest mesh make the V-cycle a symmetric
 * positive-definite operator, as conjugate gradients require. Numerical method, no standard.
 */
import type { BlockModel } from './junction-geometry';
import { cellRegion, type Mesh } from './junction-mesh';
import type { Constraints } from './junction-assemble';
import { incompleteCholesky, multiply, type Csr, type Preconditioner } from './junction-sparse';

/** Interpolation from a coarse mesh's free rows to a fine mesh's: row r takes Σ w·coarse[idx]. */
export interface Prolongation {
	ptr: Int32Array;
	idx: Int32Array;
	w: Float64Array;
	coarseN: number;
}

/** Coarse cells (along one axis) that hold fine grid line g: one for an odd line, two for an even one. */
function cellsOf(g: number, cells: number, out: Int32Array): number {
	if (g % 2) {
		out[0] = (g - 1) / 2;
		return 1;
	}
	let k = 0;
	if (g / 2 - 1 >= 0) out[k++] = g / 2 - 1;
	if (g / 2 < cells) out[k++] = g / 2;
	return k;
}

/** The coarse cell of material that holds fine grid point (i, j), as [ci, cj], or null. */
export function coarseCellOf(
	b: BlockModel,
	coarse: Mesh,
	i: number,
	j: number,
	ci: Int32Array,
	cj: Int32Array
) {
	const ni = cellsOf(i, coarse.nx, ci);
	const nj = cellsOf(j, coarse.ny, cj);
	for (let q = 0; q < nj; q++)
		for (let p = 0; p < ni; p++) if (cellRegion(b, coarse, ci[p], cj[q]) >= 0) return [ci[p], cj[q]] as const;
	return null;
}

/** Bilinear interpolation weights of fine point (x, y) in coarse cell (ci, cj), corners 00, 10, 11, 01. */
export function bilinearWeights(
	m: Mesh,
	ci: number,
	cj: number,
	x: number,
	y: number,
	out: Float64Array
): void {
	const s = (x - m.xs[ci]) / (m.xs[ci + 1] - m.xs[ci]);
	const t = (y - m.ys[cj]) / (m.ys[cj + 1] - m.ys[cj]);
	out[0] = (1 - s) * (1 - t);
	out[1] = s * (1 - t);
	out[2] = s * t;
	out[3] = (1 - s) * t;
}

/** P from the coarse mesh's free rows to the fine mesh's free rows. */
export function buildProlongation(
	b: BlockModel,
	coarse: Mesh,
	cc: Constraints,
	fine: Mesh,
	fc: Constraints
): Prolongation {
	const ptr = new Int32Array(fc.freeCount + 1);
	const idx: number[] = [];
	const w: number[] = [];
	const ci = new Int32Array(2);
	const cj = new Int32Array(2);
	const wt = new Float64Array(4);
	const cw = coarse.nx + 1;
	for (let r = 0; r < fc.freeCount; r++) {
		const n = fc.freeNode[r];
		const i = fine.nodeI[n];
		const j = fine.nodeJ[n];
		const cell = coarseCellOf(b, coarse, i, j, ci, cj);
		if (cell) {
			const [x, y] = cell;
			bilinearWeights(coarse, x, y, fine.xs[i], fine.ys[j], wt);
			const corners = [y * cw + x, y * cw + x + 1, (y + 1) * cw + x + 1, (y + 1) * cw + x];
			for (let k = 0; k < 4; k++) {
				const row = cc.freeId[coarse.node[corners[k]]];
				if (row >= 0 && wt[k] > 1e-14) {
					idx.push(row);
					w.push(wt[k]);
				}
			}
		}
		ptr[r + 1] = idx.length;
	}
	return { ptr, idx: Int32Array.from(idx), w: Float64Array.from(w), coarseN: cc.freeCount };
}

/** Exact solve on the coarsest mesh: Cholesky of the band of A (rows ordered along the grid). */
interface BandCholesky {
	n: number;
	bw: number;
	l: Float64Array;
}

function bandwidth(a: Csr): number {
	let bw = 0;
	for (let i = 0; i < a.n; i++)
		for (let k = a.rowPtr[i]; k < a.rowPtr[i + 1]; k++) bw = Math.max(bw, i - a.col[k]);
	return bw;
}

/** Band Cholesky, or null if a pivot is not positive (not expected for these matrices). */
function bandCholesky(a: Csr, bw: number): BandCholesky | null {
	const n = a.n;
	const s = bw + 1;
	const l = new Float64Array(n * s);
	for (let i = 0; i < n; i++)
		for (let k = a.rowPtr[i]; k < a.rowPtr[i + 1]; k++)
			if (a.col[k] <= i) l[i * s + a.col[k] - i + bw] = a.val[k];
	for (let i = 0; i < n; i++) {
		for (let j = Math.max(0, i - bw); j <= i; j++) {
			let v = l[i * s + j - i + bw];
			for (let k = Math.max(0, i - bw); k < j; k++) v -= l[i * s + k - i + bw] * l[j * s + k - j + bw];
			if (j < i) l[i * s + j - i + bw] = v / l[j * s + bw];
			else if (v > 0) l[i * s + bw] = Math.sqrt(v);
			else return null;
		}
	}
	return { n, bw, l };
}

function bandSolve(c: BandCholesky, b: Float64Array, x: Float64Array): void {
	const { n, bw, l } = c;
	const s = bw + 1;
	for (let i = 0; i < n; i++) {
		let v = b[i];
		for (let k = Math.max(0, i - bw); k < i; k++) v -= l[i * s + k - i + bw] * x[k];
		x[i] = v / l[i * s + bw];
	}
	for (let i = n - 1; i >= 0; i--) {
		const xi = x[i] / l[i * s + bw];
		x[i] = xi;
		for (let k = Math.max(0, i - bw); k < i; k++) x[k] -= l[i * s + k - i + bw] * xi;
	}
}

/** The coarsest band is factorised when n·bw² stays below this (about 0.2 s here); else IC(0) stands in. */
const BAND_WORK_MAX = 1e8;

/**
 * Zebra line relaxation needs, per direction, the rows of odd and of even lines (ascending, which is
 * grid order) and, per row, the CSR entries coupling it to its neighbours before and after it on
 * its line (−1 at a line's end).
 */
interface Zebra {
	/** rows on even lines, rows on odd lines */
	rows: [Int32Array, Int32Array];
	before: Int32Array;
	after: Int32Array;
}

/** Lines along x (rows of the grid; parity of j) or along y (columns; parity of i). */
function zebra(m: Mesh, c: Constraints, slot: Int32Array, alongX: boolean): Zebra {
	const n = c.freeCount;
	const before = new Int32Array(n);
	const after = new Int32Array(n);
	const parity = new Uint8Array(n);
	let odd = 0;
	for (let r = 0; r < n; r++) {
		before[r] = slot[r * 9 + (alongX ? 3 : 1)];
		after[r] = slot[r * 9 + (alongX ? 5 : 7)];
		const node = c.freeNode[r];
		parity[r] = (alongX ? m.nodeJ[node] : m.nodeI[node]) & 1;
		odd += parity[r];
	}
	const rows: [Int32Array, Int32Array] = [new Int32Array(n - odd), new Int32Array(odd)];
	const fill = [0, 0];
	for (let r = 0; r < n; r++) rows[parity[r]][fill[parity[r]]++] = r;
	return { rows, before, after };
}

interface Grid {
	a: Csr;
	diag: Float64Array;
	/** from the next coarser grid to this one (absent on the coarsest) */
	p?: Prolongation;
	x: Float64Array;
	b: Float64Array;
	res: Float64Array;
	zx: Zebra;
	zy: Zebra;
	/** Thomas algorithm scratch, by row */
	cp: Float64Array;
	dp: Float64Array;
}

function diagonal(a: Csr): Float64Array {
	const d = new Float64Array(a.n);
	for (let i = 0; i < a.n; i++)
		for (let k = a.rowPtr[i]; k < a.rowPtr[i + 1]; k++) if (a.col[k] === i) d[i] = a.val[k];
	return d;
}

/**
 * Line relaxation of the lines of one parity: every line's tridiagonal system (its own couplings)
 * solved exactly by the Thomas algorithm, couplings to other lines from the current x. Lines of
 * one parity do not touch each other (the stencil reaches one line either side), so all of them
 * are solved together, sweeping the rows in grid order: elimination forwards, substitution back.
 */
function relaxParity(g: Grid, z: Zebra, parity: 0 | 1): void {
	const { rowPtr, col, val } = g.a;
	const { x, b, diag, cp, dp } = g;
	const { before, after } = z;
	const rows = z.rows[parity];
	for (let q = 0; q < rows.length; q++) {
		const r = rows[q];
		let rhs = b[r];
		const end = rowPtr[r + 1];
		for (let k = rowPtr[r]; k < end; k++) rhs -= val[k] * x[col[k]];
		rhs += diag[r] * x[r];
		const lo = before[r];
		const hi = after[r];
		let denom = diag[r];
		if (hi >= 0) rhs += val[hi] * x[col[hi]];
		if (lo >= 0) {
			const l = val[lo];
			const p = col[lo];
			rhs += l * x[p];
			denom -= l * cp[p];
			rhs -= l * dp[p];
		}
		cp[r] = hi >= 0 ? val[hi] / denom : 0;
		dp[r] = rhs / denom;
	}
	for (let q = rows.length - 1; q >= 0; q--) {
		const r = rows[q];
		const hi = after[r];
		x[r] = hi >= 0 ? dp[r] - cp[r] * x[col[hi]] : dp[r];
	}
}

/** Zebra line Gauss–Seidel in one direction: even lines then odd, or (the adjoint) odd then even. */
function relax(g: Grid, z: Zebra, forward: boolean): void {
	relaxParity(g, z, forward ? 0 : 1);
	relaxParity(g, z, forward ? 1 : 0);
}

/** coarse.b = Pᵀ·fine.res */
function restrict(fine: Grid, coarse: Grid): void {
	const p = fine.p!;
	coarse.b.fill(0);
	for (let r = 0; r < fine.a.n; r++) {
		const v = fine.res[r];
		for (let k = p.ptr[r]; k < p.ptr[r + 1]; k++) coarse.b[p.idx[k]] += p.w[k] * v;
	}
}

/** fine.x += P·coarse.x */
function interpolate(coarse: Grid, fine: Grid): void {
	const p = fine.p!;
	for (let r = 0; r < fine.a.n; r++) {
		let s = 0;
		for (let k = p.ptr[r]; k < p.ptr[r + 1]; k++) s += p.w[k] * coarse.x[p.idx[k]];
		fine.x[r] += s;
	}
}

/** One level of the hierarchy: its mesh, constraints, matrix and entry slots. */
export interface MultigridLevel {
	mesh: Mesh;
	c: Constraints;
	a: Csr;
	slot: Int32Array;
	/** from the previous (coarser) level; absent on the coarsest */
	p?: Prolongation;
}

/**
 * The V-cycle preconditioner over `levels` (coarsest first). Smoothing: line Gauss–Seidel along x
 * and then y before the coarse correction, y and then x in reverse after it (the adjoint, so the
 * cycle is symmetric); lines make it robust to thin layers and stretched cells.
 */
export function multigrid(levels: MultigridLevel[]): Preconditioner {
	const grids: Grid[] = levels.map((l) => ({
		a: l.a,
		diag: diagonal(l.a),
		p: l.p,
		x: new Float64Array(l.a.n),
		b: new Float64Array(l.a.n),
		res: new Float64Array(l.a.n),
		zx: zebra(l.mesh, l.c, l.slot, true),
		zy: zebra(l.mesh, l.c, l.slot, false),
		cp: new Float64Array(l.a.n),
		dp: new Float64Array(l.a.n)
	}));
	const coarsest = grids[0];
	const bw = bandwidth(coarsest.a);
	const band = coarsest.a.n * bw * bw <= BAND_WORK_MAX ? bandCholesky(coarsest.a, bw) : null;
	const fallback = band ? null : incompleteCholesky(coarsest.a);
	const cycle = (k: number): void => {
		const g = grids[k];
		if (k === 0) {
			if (band) bandSolve(band, g.b, g.x);
			else fallback!.apply(g.b, g.x);
			return;
		}
		g.x.fill(0);
		relax(g, g.zx, true);
		relax(g, g.zy, true);
		multiply(g.a, g.x, g.res);
		for (let i = 0; i < g.a.n; i++) g.res[i] = g.b[i] - g.res[i];
		restrict(g, grids[k - 1]);
		cycle(k - 1);
		interpolate(grids[k - 1], g);
		relax(g, g.zy, false);
		relax(g, g.zx, false);
	};
	const top = grids[grids.length - 1];
	return {
		kind: 'multigrid',
		shift: 0,
		apply(r, z) {
			top.b.set(r);
			cycle(grids.length - 1);
			z.set(top.x);
		}
	};
}
