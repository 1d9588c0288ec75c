/**
 * The one-dimensional finite-element kernel for steady conduction through a series of elements.
 *
 * Element e joins node e and node e + 1 with conductance g[e]. Its element matrix is
 * g·[[1, −1], [−1, 1]]; assembling all of them gives a symmetric tridiagonal global matrix
 * (diagonal g[e−1] + g[e], off-diagonal −g[e]). The two end nodes are fixed (Dirichlet), the
 * interior nodes are solved by the Thomas algorithm, and the flux follows from any element.
 *
 * Heat uses g = 1/R (W/(m²·K)) with temperatures; vapour diffusion uses g = δ0/sd
 * (kg/(m²·s·Pa)) with vapour pressures. A zero resistance (R = 0, or sd = 0) is passed as
 * g = Infinity: the two nodes of such an element are merged into one before assembly, so the
 * system stays finite and exact.
 */

/** Scratch space for {@link solveSeries}; reuse it across calls to avoid allocation. */
export interface SeriesWork {
	/** compacted conductances (zero-resistance elements removed) */
	g: { [index: number]: number; length: number };
	/** Thomas algorithm modified super-diagonal */
	c: { [index: number]: number; length: number };
	/** Thomas algorithm modified right-hand side, then the solved group values */
	d: { [index: number]: number; length: number };
}

/** Allocate scratch space for chains of up to `maxElements` elements. */
export function createSeriesWork(maxElements: number): SeriesWork {
	const n = Math.max(1, maxElements) + 1;
	// Plain arrays: much cheaper to allocate than small typed arrays.
	return { g: new Array<number>(n).fill(0), c: new Array<number>(n).fill(0), d: new Array<number>(n).fill(0) };
}

/**
 * Solve the chain of elements `from … to − 1` (nodes `from … to`) with node `from` held at
 * `left` and node `to` held at `right`. Writes every node value into `out[from … to]` and returns
 * the flux from the left end towards the right end, in units of g × value
 * (W/m² for heat with g in W/(m²·K); kg/(m²·s) for vapour with g in kg/(m²·s·Pa)).
 *
 * Conductances must be > 0; Infinity marks a zero-resistance element. Throws if the whole
 * chain has zero resistance while the two fixed values differ.
 */
export function solveSeries(
	g: ArrayLike<number>,
	from: number,
	to: number,
	left: number,
	right: number,
	out: { [index: number]: number },
	work?: SeriesWork
): number {
	const w = work && work.g.length > to - from ? work : createSeriesWork(to - from);
	const gc = w.g;
	const cp = w.c;
	const t = w.d;

	// Merge nodes joined by zero-resistance elements: only finite conductances are assembled.
	let m = 0;
	for (let e = from; e < to; e++) {
		const ge = g[e];
		if (!(ge > 0)) throw new RangeError(`element ${e}: conductance must be > 0, got ${ge}`);
		if (ge !== Infinity) gc[m++] = ge;
	}
	if (m === 0) {
		if (left !== right) throw new RangeError('series has zero total resistance between different end values');
		for (let i = from; i <= to; i++) out[i] = left;
		return 0;
	}

	// Unknowns are the merged nodes 1 … m − 1; merged node 0 is `left`, merged node m is `right`.
	// Row i of the assembled matrix: −g[i−1]·T[i−1] + (g[i−1] + g[i])·T[i] − g[i]·T[i+1] = 0, with
	// the fixed end values moved to the right-hand side of rows 1 and m − 1.
	t[0] = left;
	t[m] = right;
	if (m >= 2) {
		// Forward sweep (one reciprocal per row on the critical path).
		let gPrev = gc[0];
		let c = 0; // modified super-diagonal of the previous row
		let d = gPrev * left; // modified right-hand side of the previous row (row 1 before scaling)
		for (let i = 1; i < m; i++) {
			const gi = gc[i];
			const inv = 1 / (gPrev + gi + gPrev * c); // b − a·c' with a = −g[i−1]
			const rhs = i === 1 ? d : gPrev * d; // d_i − a·d'_{i−1}, d_i = 0 for interior rows
			c = -gi * inv;
			d = (i === m - 1 ? rhs + gi * right : rhs) * inv;
			cp[i] = c;
			t[i] = d;
			gPrev = gi;
		}
		// Back substitution: T[i] = d'[i] − c'[i]·T[i+1] (the last row has no super-diagonal).
		for (let i = m - 2; i >= 1; i--) t[i] -= cp[i] * t[i + 1];
	}

	// Map merged values back onto every node.
	if (m === to - from) {
		for (let i = 1; i < m; i++) out[from + i] = t[i];
	} else {
		let k = 0;
		for (let e = from; e < to; e++) {
			if (g[e] !== Infinity) k++;
			out[e + 1] = t[k];
		}
	}
	out[from] = left;
	out[to] = right;
	return gc[0] * (t[0] - t[1]);
}
