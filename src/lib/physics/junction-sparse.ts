/**
 * Sparse symmetric positive-definite systems for the two-dimensional junction solve: a matrix in
 * compressed sparse row form (CSR, both triangles stored, columns ascending in every row), its
 * product with a vector, an incomplete Cholesky factor without fill (IC(0)) and preconditioned
 * conjugate gradients. Typed arrays only; the iteration allocates nothing (its vectors live in a
 * workspace made once per solve). Numerical methods, no standard.
 */

/** A square sparse matrix in CSR form: row i holds `col[rowPtr[i]..rowPtr[i+1])` and `val[…]`. */
export interface Csr {
	n: number;
	rowPtr: Int32Array;
	col: Int32Array;
	val: Float64Array;
}

/** y = A·x. */
export function multiply(a: Csr, x: Float64Array, y: Float64Array): void {
	const { n, rowPtr, col, val } = a;
	for (let i = 0; i < n; i++) {
		let s = 0;
		const end = rowPtr[i + 1];
		for (let k = rowPtr[i]; k < end; k++) s += val[k] * x[col[k]];
		y[i] = s;
	}
}

/** A preconditioner: z = M⁻¹·r. */
export interface Preconditioner {
	kind: 'ic0' | 'jacobi' | 'multigrid';
	apply(r: Float64Array, z: Float64Array): void;
	/** the diagonal shift, as a fraction of the diagonal, that IC(0) needed to exist (0: none) */
	shift: number;
}

/** Jacobi (diagonal) preconditioner. */
export function jacobi(a: Csr): Preconditioner {
	const inv = new Float64Array(a.n);
	for (let i = 0; i < a.n; i++) {
		for (let k = a.rowPtr[i]; k < a.rowPtr[i + 1]; k++) if (a.col[k] === i) inv[i] = 1 / a.val[k];
	}
	return {
		kind: 'jacobi',
		shift: 0,
		apply(r, z) {
			for (let i = 0; i < inv.length; i++) z[i] = r[i] * inv[i];
		}
	};
}

/** The strictly lower part of A's pattern (row i: columns < i), with the position of each diagonal. */
function lowerPattern(a: Csr): { ptr: Int32Array; col: Int32Array; src: Int32Array; diag: Int32Array } {
	const { n, rowPtr, col } = a;
	const ptr = new Int32Array(n + 1);
	const diag = new Int32Array(n).fill(-1);
	for (let i = 0; i < n; i++) {
		let c = 0;
		for (let k = rowPtr[i]; k < rowPtr[i + 1]; k++) {
			if (col[k] < i) c++;
			else if (col[k] === i) diag[i] = k;
		}
		ptr[i + 1] = ptr[i] + c;
	}
	const lcol = new Int32Array(ptr[n]);
	const src = new Int32Array(ptr[n]);
	for (let i = 0, p = 0; i < n; i++) {
		for (let k = rowPtr[i]; k < rowPtr[i + 1]; k++) {
			if (col[k] < i) {
				lcol[p] = col[k];
				src[p++] = k;
			}
		}
	}
	return { ptr, col: lcol, src, diag };
}

/**
 * IC(0) of A + shift·diag(A) into `lval` (strictly lower entries) and `invDiag` (1/Lii); false on
 * a pivot that is not clearly positive. Row i's entry (i,k) is (A_ik − Σ_j L_ij·L_kj)/L_kk over the
 * columns j < k that rows i and k share (both sorted, so a merge).
 */
function factorIc0(
	a: Csr,
	p: ReturnType<typeof lowerPattern>,
	shift: number,
	lval: Float64Array,
	invDiag: Float64Array
): boolean {
	const { ptr, col, src, diag } = p;
	for (let i = 0; i < a.n; i++) {
		const s0 = ptr[i];
		const e0 = ptr[i + 1];
		let d = a.val[diag[i]] * (1 + shift);
		for (let q = s0; q < e0; q++) {
			const k = col[q];
			let s = a.val[src[q]];
			let u = s0;
			let v = ptr[k];
			const ve = ptr[k + 1];
			while (u < q && v < ve) {
				const cu = col[u];
				const cv = col[v];
				if (cu === cv) s -= lval[u++] * lval[v++];
				else if (cu < cv) u++;
				else v++;
			}
			const l = s * invDiag[k];
			lval[q] = l;
			d -= l * l;
		}
		if (!(d > 1e-12 * a.val[diag[i]])) return false;
		invDiag[i] = 1 / Math.sqrt(d);
	}
	return true;
}

/**
 * Incomplete Cholesky preconditioner with no fill, IC(0). Bilinear elements on cells of high
 * aspect ratio give positive off-diagonal entries, and IC(0) of such a matrix can fail; it is then
 * formed again from A + α·diag(A), α = 10⁻³ doubling (the usual remedy), and falls back to Jacobi
 * if even α = 1 fails.
 */
export function incompleteCholesky(a: Csr): Preconditioner {
	const pattern = lowerPattern(a);
	for (let i = 0; i < a.n; i++) if (pattern.diag[i] < 0) return jacobi(a);
	const lval = new Float64Array(pattern.col.length);
	const invDiag = new Float64Array(a.n);
	let shift = 0;
	while (!factorIc0(a, pattern, shift, lval, invDiag)) {
		shift = shift === 0 ? 1e-3 : shift * 2;
		if (shift > 1) return jacobi(a);
	}
	const { ptr, col } = pattern;
	return {
		kind: 'ic0',
		shift,
		apply(r, z) {
			const n = a.n;
			for (let i = 0; i < n; i++) {
				let s = r[i];
				for (let q = ptr[i]; q < ptr[i + 1]; q++) s -= lval[q] * z[col[q]];
				z[i] = s * invDiag[i];
			}
			for (let i = n - 1; i >= 0; i--) {
				const zi = z[i] * invDiag[i];
				z[i] = zi;
				for (let q = ptr[i]; q < ptr[i + 1]; q++) z[col[q]] -= lval[q] * zi;
			}
		}
	};
}

const dot = (a: Float64Array, b: Float64Array): number => {
	let s = 0;
	for (let i = 0; i < a.length; i++) s += a[i] * b[i];
	return s;
};

export interface PcgResult {
	iterations: number;
	/** ‖b − A·x‖₂ / ‖b‖₂ of the returned x, recomputed at the end */
	relativeResidual: number;
	converged: boolean;
}

export interface PcgOptions {
	/** stop when ‖r‖₂ ≤ tolerance·‖b‖₂ */
	tolerance: number;
	maxIterations: number;
}

/** r = b − A·x (q is scratch); returns ‖r‖₂. */
function trueResidual(a: Csr, b: Float64Array, x: Float64Array, r: Float64Array, q: Float64Array): number {
	multiply(a, x, q);
	let rr = 0;
	for (let i = 0; i < a.n; i++) {
		r[i] = b[i] - q[i];
		rr += r[i] * r[i];
	}
	return Math.sqrt(rr);
}

/** Most restarts from the true residual when the recurrence has drifted below it. */
const RESTARTS_MAX = 1;

/**
 * Preconditioned conjugate gradients for A·x = b, A symmetric positive definite; `x` holds the
 * initial guess on entry and the solution on return. When the recursive residual meets the
 * tolerance but the true one b − A·x does not (rounding drift in ill-conditioned systems), the
 * iteration restarts from the true residual, at most RESTARTS_MAX times. Four work vectors are
 * allocated once here, none inside the iteration.
 */
export function solvePcg(
	a: Csr,
	b: Float64Array,
	x: Float64Array,
	m: Preconditioner,
	o: PcgOptions
): PcgResult {
	const n = a.n;
	const r = new Float64Array(n);
	const z = new Float64Array(n);
	const p = new Float64Array(n);
	const q = new Float64Array(n);
	const bNorm = Math.sqrt(dot(b, b));
	if (n === 0 || bNorm === 0) {
		x.fill(0);
		return { iterations: 0, relativeResidual: 0, converged: true };
	}
	const goal = o.tolerance * bNorm;
	let it = 0;
	let norm = trueResidual(a, b, x, r, q);
	for (let restart = 0; restart <= RESTARTS_MAX && norm > goal && it < o.maxIterations; restart++) {
		m.apply(r, z);
		p.set(z);
		let rz = dot(r, z);
		while (it < o.maxIterations && Math.sqrt(dot(r, r)) > goal) {
			multiply(a, p, q);
			const pq = dot(p, q);
			if (!(pq > 0) || !(rz > 0)) break;
			const alpha = rz / pq;
			for (let i = 0; i < n; i++) {
				x[i] += alpha * p[i];
				r[i] -= alpha * q[i];
			}
			m.apply(r, z);
			const rzNew = dot(r, z);
			const beta = rzNew / rz;
			rz = rzNew;
			for (let i = 0; i < n; i++) p[i] = z[i] + beta * p[i];
			it++;
		}
		norm = trueResidual(a, b, x, r, q);
	}
	const relativeResidual = norm / bNorm;
	return { iterations: it, relativeResidual, converged: relativeResidual <= o.tolerance * 100 };
}
