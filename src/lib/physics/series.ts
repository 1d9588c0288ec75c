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
 * g = Infinity: the two nodes of such an element are merged into one node during the sweep, so
 * the system stays finite and exact.
 */

/** Scratch space for {@link solveSeries}; reuse it across calls to avoid allocation. */
export interface SeriesWork {
	/** the forward sweep's coefficients c[i] of T[i] = d[i] − c[i]·T[i+1], by node index */
	c: { [index: number]: number; length: number };
}

/** Allocate scratch space for chains whose last node index is at most `maxNodeIndex`. */
export function createSeriesWork(maxNodeIndex: number): SeriesWork {
	// A plain array: much cheaper to allocate than a small typed array.
	const c = new Array<number>(Math.max(1, maxNodeIndex) + 1);
	for (let i = 0; i < c.length; i++) c[i] = 0;
	return { c };
}

/**
 * Solve the chain of elements `from … to − 1` (nodes `from … to`) with node `from` held at
 * `left` and node `to` held at `right`. Writes every node value into `out[from … to]` and returns
 * the flux from the left end towards the right end, in units of g × value
 * (W/m² for heat with g in W/(m²·K); kg/(m²·s) for vapour with g in kg/(m²·s·Pa)).
 *
 * Row i of the assembled matrix reads −g[i−1]·T[i−1] + (g[i−1] + g[i])·T[i] − g[i]·T[i+1] = 0.
 * The forward sweep of the Thomas algorithm turns each row into T[i] = d[i] − c[i]·T[i+1]; back
 * substitution then runs from the fixed right end. An element of g = Infinity joins its two nodes:
 * its row becomes T[i] = T[i+1] (c = −1, d = 0) and the next row takes over the left-hand state,
 * which is exactly the assembly of the merged node.
 *
 * Conductances must be > 0. Throws if the whole chain has zero resistance while the two fixed
 * values differ.
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
	const cs = (work && work.c.length > to ? work : createSeriesWork(to)).c;
	let gl = g[from];
	if (!(gl > 0)) throw new RangeError(`element ${from}: conductance must be > 0, got ${gl}`);
	let c = 0;
	let d = left;
	out[from] = left;
	for (let i = from + 1; i < to; i++) {
		const gr = g[i];
		if (!(gr > 0)) throw new RangeError(`element ${i}: conductance must be > 0, got ${gr}`);
		if (gr !== Infinity && gl !== Infinity) {
			const inv = 1 / (gl + gr + gl * c);
			d = gl * d * inv;
			c = -gr * inv;
			cs[i] = c;
			out[i] = d;
			gl = gr;
		} else if (gl === Infinity) {
			// Still joined to the fixed left node: T[i] = left.
			cs[i] = 0;
			out[i] = left;
			gl = gr;
		} else {
			// Node i + 1 joins node i; the merged row continues with the same left-hand state.
			cs[i] = -1;
			out[i] = 0;
		}
	}
	if (gl === Infinity && to > from) {
		// Every element so far joined the left node; the last element joins the right one too.
		if (left !== right) throw new RangeError('series has zero total resistance between different end values');
	}
	out[to] = right;
	let next = right;
	for (let i = to - 1; i > from; i--) {
		next = out[i] - cs[i] * next;
		out[i] = next;
	}
	// Flux through the first element of finite conductance.
	for (let e = from; e < to; e++) {
		const ge = g[e];
		if (ge !== Infinity) return ge * (out[e] - out[e + 1]);
	}
	return 0;
}
