// The numerical kernel of the junction solve against outside references: the assembled system
// solved densely by ml-matrix (a general-purpose npm linear-algebra library), the textbook
// bilinear element (common practice, no source), and the identities the multigrid preconditioner
// relies on (nested bilinear spaces give Pᵀ·A_fine·P = A_coarse; a V-cycle with adjoint
// smoothing is symmetric), checked numerically.
import { Matrix, solve } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { parseJunctionInput, type JunctionInput } from '../../src/lib/physics/junction';
import { assemble, constraints, elementMatrix } from '../../src/lib/physics/junction-assemble';
import { boundaryEdges, buildMesh, coarseDivisions, intervalMap } from '../../src/lib/physics/junction-mesh';
import { buildProlongation, multigrid, type MultigridLevel } from '../../src/lib/physics/junction-multigrid';
import { incompleteCholesky, jacobi, solvePcg, type Csr } from '../../src/lib/physics/junction-sparse';

type Pt = [number, number];
const P = (x: number, y: number): Pt => [x, y];

// An L-shaped corner of two materials with a fixed-temperature edge (invented demo input), so
// that Robin edges, fixed nodes and material interfaces are all in the system.
const corner: JunctionInput = {
	regions: [
		{ x0: 0, y0: 0, x1: 900, y1: 250, lambda: 0.9 },
		{ x0: 0, y0: 0, x1: 250, y1: 900, lambda: 0.9 },
		{ x0: 250, y0: 0, x1: 900, y1: 80, lambda: 0.04 }
	],
	boundaries: [
		{ from: P(0, 0), to: P(900, 0), environment: 'out' },
		{ from: P(0, 0), to: P(0, 900), environment: 'out' },
		{ from: P(250, 250), to: P(900, 250), environment: 'in' },
		{ from: P(250, 250), to: P(250, 900), environment: 'fixed' }
	],
	environments: {
		in: { temperature: 20, rs: 0.13 },
		out: { temperature: -5, rs: 0.04 },
		fixed: { temperature: 18, rs: 0 }
	}
};

function hierarchy(levels: number) {
	const parsed = parseJunctionInput(corner);
	if (!parsed.ok) throw new Error(JSON.stringify(parsed.issues));
	const b = parsed.blocks;
	const div = coarseDivisions(b);
	const out: (MultigridLevel & { rhs: Float64Array })[] = [];
	for (let level = 0; level < levels; level++) {
		const mesh = buildMesh(b, div, level)!;
		const c = constraints(b, mesh, boundaryEdges(b, mesh));
		const s = assemble(b, mesh, boundaryEdges(b, mesh), c, -5);
		const prev = out[level - 1];
		out.push({
			mesh,
			c,
			a: s.a,
			slot: s.slot,
			rhs: s.b,
			p: prev ? buildProlongation(b, prev.mesh, prev.c, mesh, c) : undefined
		});
	}
	return out;
}

const dense = (a: Csr): Matrix => {
	const m = Matrix.zeros(a.n, a.n);
	for (let i = 0; i < a.n; i++)
		for (let k = a.rowPtr[i]; k < a.rowPtr[i + 1]; k++) m.set(i, a.col[k], a.val[k]);
	return m;
};

describe('bilinear element (textbook values, common practice, no source)', () => {
	it('a unit square of λ = 1: 2/3 on the diagonal, −1/6 to the edge neighbours, −1/3 across', () => {
		const k = new Float64Array(16);
		elementMatrix(1, 100, 100, k);
		expect(k[0]).toBeCloseTo(2 / 3, 14);
		expect(k[1]).toBeCloseTo(-1 / 6, 14);
		expect(k[3]).toBeCloseTo(-1 / 6, 14);
		expect(k[2]).toBeCloseTo(-1 / 3, 14);
	});
	it('rows sum to zero (a uniform temperature carries no heat) and the matrix is symmetric', () => {
		const k = new Float64Array(16);
		elementMatrix(0.7, 13, 170, k);
		for (let i = 0; i < 4; i++) {
			expect(Math.abs(k[i * 4] + k[i * 4 + 1] + k[i * 4 + 2] + k[i * 4 + 3])).toBeLessThan(1e-12);
			for (let j = 0; j < 4; j++) expect(k[i * 4 + j]).toBeCloseTo(k[j * 4 + i], 14);
		}
	});
});

describe('graded interval map', () => {
	it('runs from a to b, increases, and keeps every line when the count is doubled', () => {
		const m = intervalMap(10, 1010, 1, 30, 120);
		expect(m.at(0)).toBe(10);
		expect(m.at(1)).toBe(1010);
		const n = Math.ceil(m.total);
		let prev = -Infinity;
		for (let c = 0; c <= 4 * n; c++) {
			const x = m.at(c / (4 * n));
			expect(x).toBeGreaterThan(prev);
			prev = x;
			if (c % 2 === 0) expect(x).toBe(m.at(c / 2 / (2 * n)));
		}
		// the first cell spans the end size growing at 1.5 over one cell: d·(e^0.5 − 1)/0.5 at most
		expect(m.at(1 / n) - 10).toBeGreaterThan(1);
		expect(m.at(1 / n) - 10).toBeLessThan((Math.exp(0.5) - 1) / 0.5);
		for (let c = 0; c < n; c++) expect(m.at((c + 1) / n) - m.at(c / n)).toBeLessThanOrEqual(120 + 1e-9);
	});
});

describe('preconditioned conjugate gradients against a dense solve (ml-matrix)', () => {
	const levels = hierarchy(3);
	const top = levels[0];
	const reference = solve(dense(top.a), Matrix.columnVector(Array.from(top.rhs))).to1DArray();
	const scale = Math.max(...reference.map(Math.abs));
	it('works on a system of a useful size', () => expect(top.a.n).toBeGreaterThan(300));
	const cases: [string, () => ReturnType<typeof jacobi>][] = [
		['Jacobi', () => jacobi(top.a)],
		['IC(0)', () => incompleteCholesky(top.a)],
		[
			'multigrid on one level (the banded Cholesky solve of the coarsest mesh)',
			() => multigrid(levels.slice(0, 1))
		]
	];
	for (const [name, make] of cases)
		it(`${name}: the same solution to 1e-8 of its scale`, () => {
			const x = new Float64Array(top.a.n);
			const r = solvePcg(top.a, top.rhs, x, make(), { tolerance: 1e-12, maxIterations: 5000 });
			expect(r.converged).toBe(true);
			const worst = Math.max(...reference.map((v, i) => Math.abs(v - x[i])));
			expect(worst / scale).toBeLessThan(1e-8);
		});

	it('multigrid over two levels: the solution of IC(0)-preconditioned CG (checked above) on the finer mesh', () => {
		const fine = levels[1];
		const a = new Float64Array(fine.a.n);
		const b = new Float64Array(fine.a.n);
		solvePcg(fine.a, fine.rhs, a, incompleteCholesky(fine.a), { tolerance: 1e-12, maxIterations: 5000 });
		solvePcg(fine.a, fine.rhs, b, multigrid(levels.slice(0, 2)), { tolerance: 1e-12, maxIterations: 5000 });
		const worst = Math.max(...a.map((v, i) => Math.abs(v - b[i])));
		expect(worst / Math.max(...a.map(Math.abs))).toBeLessThan(1e-9);
	});

	it('multigrid needs far fewer iterations than IC(0) and Jacobi on the finer mesh', () => {
		const fine = levels[2];
		const its = [jacobi(fine.a), incompleteCholesky(fine.a), multigrid(levels)].map(
			(m) =>
				solvePcg(fine.a, fine.rhs, new Float64Array(fine.a.n), m, { tolerance: 1e-10, maxIterations: 20000 })
					.iterations
		);
		expect(its[2]).toBeLessThan(its[1]);
		expect(its[1]).toBeLessThan(its[0]);
		expect(its[2]).toBeLessThan(20);
	});
});

describe('multigrid identities', () => {
	const levels = hierarchy(2);
	it('the coarse matrix equals Pᵀ·A_fine·P (nested bilinear spaces)', () => {
		const [coarse, fine] = levels;
		const p = fine.p!;
		const nc = coarse.a.n;
		const galerkin = new Float64Array(nc * nc); // Σ over fine entries of P[r][i]·A[r][c]·P[c][j]
		for (let r = 0; r < fine.a.n; r++)
			for (let k = fine.a.rowPtr[r]; k < fine.a.rowPtr[r + 1]; k++) {
				const c = fine.a.col[k];
				for (let u = p.ptr[r]; u < p.ptr[r + 1]; u++)
					for (let v = p.ptr[c]; v < p.ptr[c + 1]; v++)
						galerkin[p.idx[u] * nc + p.idx[v]] += p.w[u] * fine.a.val[k] * p.w[v];
			}
		const direct = dense(coarse.a);
		let diff = 0;
		for (let i = 0; i < nc; i++)
			for (let j = 0; j < nc; j++) diff = Math.max(diff, Math.abs(galerkin[i * nc + j] - direct.get(i, j)));
		expect(diff / direct.abs().max()).toBeLessThan(1e-12);
	});
	it('the V-cycle is symmetric: u·M⁻¹v = v·M⁻¹u', () => {
		const m = multigrid(levels);
		const n = levels[1].a.n;
		let seed = 7;
		const rand = () => ((seed = (seed * 1103515245 + 12345) % 2147483648) / 2147483648) * 2 - 1;
		const u = Float64Array.from({ length: n }, rand);
		const v = Float64Array.from({ length: n }, rand);
		const mu = new Float64Array(n);
		const mv = new Float64Array(n);
		m.apply(u, mu);
		m.apply(v, mv);
		let a = 0;
		let b = 0;
		for (let i = 0; i < n; i++) {
			a += v[i] * mu[i];
			b += u[i] * mv[i];
		}
		expect(Math.abs(a - b) / Math.abs(a)).toBeLessThan(1e-10);
	});
});
