// Test data and independent reference calculations for the physics suites. Nothing here imports
// the engine: the references are written separately (closed-form sums, a brute-force hull, a dense
// solve) so that they check the engine rather than repeat it.
import { Matrix, solve } from 'ml-matrix';
import type { ElementInput } from '../../src/lib/physics';

/** Twelve months of one constant condition (constructed input, not a real site). */
export function constantClimate(
	temperature: number,
	relativeHumidity: number
): NonNullable<ElementInput['climate']> {
	return Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature, relativeHumidity }));
}

/** A cool-temperate monthly climate (constructed input for tests, not a real site). */
export function coolClimate(): NonNullable<ElementInput['climate']> {
	const t = [-2, -1, 3, 7, 11, 15, 17, 17, 13, 9, 4, 0];
	const rh = [90, 88, 82, 76, 74, 74, 75, 78, 83, 87, 90, 91];
	return t.map((temperature, i) => ({ month: i + 1, temperature, relativeHumidity: rh[i] }));
}

/** A climate with a cold winter (constructed input, not a real site). */
export function coldClimate(): NonNullable<ElementInput['climate']> {
	const t = [-10, -10, -5, 3, 10, 15, 18, 17, 12, 6, 0, -5];
	return t.map((temperature, i) => ({ month: i + 1, temperature, relativeHumidity: 90 }));
}

/** Closed-form series: node values of a chain of resistances between fixed end values. */
export function closedFormSeries(
	r: number[],
	left: number,
	right: number
): { values: number[]; flux: number } {
	const total = r.reduce((a, b) => a + b, 0);
	const flux = (left - right) / total;
	const values = [left];
	let acc = 0;
	for (const ri of r) {
		acc += ri;
		values.push(left - flux * acc);
	}
	return { values, flux };
}

/**
 * Dense finite-element solve with ml-matrix: assemble g·[[1,−1],[−1,1]] for every element into the
 * full (n+1)×(n+1) matrix, replace the first and last rows by the fixed values, solve by LU.
 */
export function denseSeries(g: number[], left: number, right: number): number[] {
	const n = g.length + 1;
	const k = Matrix.zeros(n, n);
	for (let e = 0; e < g.length; e++) {
		k.set(e, e, k.get(e, e) + g[e]);
		k.set(e + 1, e + 1, k.get(e + 1, e + 1) + g[e]);
		k.set(e, e + 1, k.get(e, e + 1) - g[e]);
		k.set(e + 1, e, k.get(e + 1, e) - g[e]);
	}
	const b = Matrix.zeros(n, 1);
	for (const [row, value] of [
		[0, left],
		[n - 1, right]
	] as const) {
		for (let c = 0; c < n; c++) k.set(row, c, c === row ? 1 : 0);
		b.set(row, 0, value);
	}
	return solve(k, b).to1DArray();
}

/** A deterministic pseudo-random sequence in [0, 1) (Park–Miller), for reproducible chains. */
export function lcg(seed: number): () => number {
	let s = seed % 2147483647;
	if (s <= 0) s += 2147483646;
	return () => {
		s = (s * 16807) % 2147483647;
		return (s - 1) / 2147483646;
	};
}

/** ISO 13788:2012 Annex E saturation pressure, written out again for the reference (Pa, θ in °C). */
export function psatRef(t: number): number {
	return t >= 0 ? 610.5 * Math.exp((17.269 * t) / (237.3 + t)) : 610.5 * Math.exp((21.875 * t) / (265.5 + t));
}

const DELTA0 = 2e-10; // ISO 13788:2012, δ0 in kg/(m·s·Pa) (from memory)
const DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

export interface RefLayer {
	thicknessMm: number;
	r: number;
	sd: number;
}

/**
 * Reference Glaser cycle (ISO 13788:2012 clause 6 as read): sublayers of R ≤ 0.25, temperatures by
 * the closed-form series, vapour-pressure line found by a brute-force extreme-point test (a point is
 * a contact if it lies strictly below every chord spanning it), rates from slope differences.
 * Returns per month (calendar order) the amounts at each vapour node (g/m²) and the start month.
 */
export function referenceGlaser(
	layers: RefLayer[],
	rsi: number,
	rse: number,
	months: { month: number; te: number; pe: number; ti: number; pi: number }[]
): { start: number | null; accumulated: number[][]; rates: number[][]; x: number[] } {
	// Nodes from the internal surface outwards.
	const rCum: number[] = [0];
	const xs: number[] = [0];
	for (const l of layers) {
		const n = Math.max(1, Math.ceil(l.r / 0.25 - 1e-9));
		for (let s = 0; s < n; s++) {
			rCum.push(rCum[rCum.length - 1] + l.r / n);
			xs.push(xs[xs.length - 1] + l.sd / n);
		}
	}
	const rt = rsi + rCum[rCum.length - 1] + rse;
	// Group nodes of equal sd.
	const groups: number[][] = [];
	for (let j = 0; j < xs.length; j++) {
		if (j > 0 && xs[j] === xs[j - 1]) groups[groups.length - 1].push(j);
		else groups.push([j]);
	}
	const gx = groups.map((g) => xs[g[0]]);
	const G = groups.length;

	const monthStep = (m: (typeof months)[number], wet: boolean[]) => {
		const ps = groups.map((g) =>
			Math.min(...g.map((j) => psatRef(m.ti - ((m.ti - m.te) * (rsi + rCum[j])) / rt)))
		);
		const fixed = [0];
		for (let g = 1; g < G - 1; g++) if (wet[g]) fixed.push(g);
		fixed.push(G - 1);
		const y = (g: number) => (g === 0 ? m.pi : g === G - 1 ? m.pe : ps[g]);
		const verts: number[] = [0];
		for (let f = 0; f + 1 < fixed.length; f++) {
			const a = fixed[f];
			const b = fixed[f + 1];
			for (let k = a + 1; k < b; k++) {
				let extreme = true;
				for (let i = a; i < k && extreme; i++) {
					for (let j = k + 1; j <= b && extreme; j++) {
						const chord = y(i) + ((y(j) - y(i)) * (gx[k] - gx[i])) / (gx[j] - gx[i]);
						if (!(y(k) < chord - 1e-6)) extreme = false;
					}
				}
				if (extreme) verts.push(k);
			}
			verts.push(b);
		}
		const rate = new Array(G).fill(0);
		for (let v = 1; v + 1 < verts.length; v++) {
			const [u, c, w] = [verts[v - 1], verts[v], verts[v + 1]];
			const fin = (DELTA0 * (y(u) - y(c))) / (gx[c] - gx[u]);
			const fout = (DELTA0 * (y(c) - y(w))) / (gx[w] - gx[c]);
			rate[c] = fin - fout;
		}
		return rate;
	};

	const dry = months.map((m) => monthStep(m, new Array(G).fill(false)).some((r) => r > 1e-16));
	let start: number | null = null;
	if (dry.some(Boolean)) {
		start = 0;
		if (!dry.every(Boolean))
			for (let i = 0; i < 12; i++)
				if (dry[i] && !dry[(i + 11) % 12]) {
					start = i;
					break;
				}
	}
	const ma = new Array(G).fill(0);
	const accumulated: number[][] = new Array(12);
	const rates: number[][] = new Array(12);
	for (let c = 0; c < 12; c++) {
		const i = ((start ?? 0) + c) % 12;
		const rate = monthStep(
			months[i],
			ma.map((v) => v > 0)
		);
		const secs = DAYS[months[i].month - 1] * 86400;
		rates[i] = rate.map((r) => r * secs * 1000);
		for (let g = 0; g < G; g++) {
			ma[g] = Math.max(0, ma[g] + rate[g] * secs);
			if (ma[g] < 1e-9) ma[g] = 0;
		}
		accumulated[i] = ma.map((v) => v * 1000);
	}
	return { start: start === null ? null : months[start].month, accumulated, rates, x: gx };
}

/** Walk any value and report the first number that is not finite. */
export function firstNonFinite(value: unknown, path = '$'): string | null {
	if (typeof value === 'number') return Number.isFinite(value) ? null : path;
	if (Array.isArray(value)) {
		for (let i = 0; i < value.length; i++) {
			const p = firstNonFinite(value[i], `${path}[${i}]`);
			if (p) return p;
		}
	} else if (value && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) {
			const p = firstNonFinite(v, `${path}.${k}`);
			if (p) return p;
		}
	}
	return null;
}
