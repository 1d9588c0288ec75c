/**
 * Isotherms of a sampled temperature field on a rectilinear grid: marching squares, each cell's
 * crossings found by linear interpolation along its edges (the field of bilinear elements is linear
 * along every mesh edge). Cells outside the material, or with a corner without a value, are skipped.
 * Saddle cells are resolved by the value at the cell's centre (the mean of its corners).
 */
import type { JunctionField } from '$lib/physics/junction-field';

export type Segment = [number, number, number, number];

/** Crossing of level `v` on the edge from (xa, ya, a) to (xb, yb, b), or null. */
function cross(
	v: number,
	xa: number,
	ya: number,
	a: number,
	xb: number,
	yb: number,
	b: number
): [number, number] | null {
	if ((a < v && b < v) || (a >= v && b >= v)) return null;
	const t = (v - a) / (b - a);
	return [xa + t * (xb - xa), ya + t * (yb - ya)];
}

/** The segments of one cell at level v: corners counter-clockwise from (x0, y0). */
function cellSegments(
	v: number,
	x0: number,
	x1: number,
	y0: number,
	y1: number,
	c: [number, number, number, number]
): Segment[] {
	const [a, b, cc, d] = c; // (x0,y0), (x1,y0), (x1,y1), (x0,y1)
	const edges = [
		cross(v, x0, y0, a, x1, y0, b),
		cross(v, x1, y0, b, x1, y1, cc),
		cross(v, x1, y1, cc, x0, y1, d),
		cross(v, x0, y1, d, x0, y0, a)
	];
	const hits = edges.map((p, i) => (p ? i : -1)).filter((i) => i >= 0);
	if (hits.length === 2) {
		const [p, q] = [edges[hits[0]]!, edges[hits[1]]!];
		return [[p[0], p[1], q[0], q[1]]];
	}
	if (hits.length !== 4) return [];
	const centreAbove = (a + b + cc + d) / 4 >= v;
	const aAbove = a >= v;
	// a saddle: join so that the centre's side stays connected
	const pairs =
		centreAbove === aAbove
			? [
					[0, 1],
					[2, 3]
				]
			: [
					[0, 3],
					[1, 2]
				];
	return pairs.map(([i, j]) => [edges[i]![0], edges[i]![1], edges[j]![0], edges[j]![1]] as Segment);
}

/** Line segments (x0, y0, x1, y1 in mm) of the isotherm at `level` °C. */
export function isotherm(field: JunctionField, level: number): Segment[] {
	const { xs, ys, values, cells } = field;
	const w = xs.length;
	const out: Segment[] = [];
	for (let j = 0; j + 1 < ys.length; j++)
		for (let i = 0; i + 1 < w; i++) {
			if (cells[j * (w - 1) + i] < 0) continue;
			const c = [
				values[j * w + i],
				values[j * w + i + 1],
				values[(j + 1) * w + i + 1],
				values[(j + 1) * w + i]
			];
			if (c.some((t) => t === null)) continue;
			out.push(
				...cellSegments(level, xs[i], xs[i + 1], ys[j], ys[j + 1], c as [number, number, number, number])
			);
		}
	return out;
}

/** Round levels between the field's extremes: a step of 1, 2 or 5 × 10ⁿ °C giving about `count` levels. */
export function isothermLevels(min: number, max: number, count = 8): number[] {
	if (!(max > min)) return [];
	const raw = (max - min) / count;
	const p = 10 ** Math.floor(Math.log10(raw));
	const step = [1, 2, 5, 10].map((k) => k * p).find((s) => s >= raw) ?? 10 * p;
	const out: number[] = [];
	for (let v = Math.ceil(min / step) * step; v < max; v += step)
		if (v > min) out.push(Math.round(v * 1e6) / 1e6 + 0);
	return out;
}
