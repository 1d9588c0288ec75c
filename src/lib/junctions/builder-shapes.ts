/**
 * The geometry of each junction type the builder knows: rectangles of material (mm, later ones
 * override earlier ones), the boundary segments with the environment each faces, the flanking
 * elements with their lengths in each dimension system (ISO 13789: internal, overall internal,
 * external), and the frame of the first element in which a gap in its insulation and an insert
 * are placed. Cut-off planes lie max(1 m, 3 × the flanking element's thickness) from the junction
 * (ISO 10211, as recalled); the ground extends 2.5·b beside and below a ground floor, the floor to
 * a symmetry plane at b/2, b = 8 m (ISO 10211 for an unknown floor width, as recalled).
 */
import type { JunctionBoundary, JunctionFlank, JunctionRegion } from '$lib/physics/junction-schema';
import type { DimensionSystem } from './kinds';
import { layerDepth, type ModelLayer, type ModelledElement } from './builder-layers';

export type Box = { x0: number; y0: number; x1: number; y1: number };
export type Point = [number, number];

/** An environment the shape's boundaries face: inside (warm) or outside (cold), and its surface resistance. */
export type ShapeEnvironment = { warm: boolean; rs: number };

/** The first element's frame: a point on its inside face at the junction plane, the direction along it, the direction out of it. */
export type Frame = { p0: Point; along: Point; out: Point; range: [number, number] };

export interface Shape {
	regions: JunctionRegion[];
	boundaries: JunctionBoundary[];
	environments: Record<string, ShapeEnvironment>;
	flanks: Record<DimensionSystem, JunctionFlank[]>;
	frame: Frame;
	/** the span (along the frame) a gap of this width in the first element's insulation takes */
	gapSpan: (widthMm: number) => [number, number];
	view: Box;
	notes: string[];
}

/** Distance of a cut-off plane from the junction, mm (ISO 10211, as recalled: at least 1 m, or 3 × the thickness). */
export const cutOff = (thicknessMm: number): number => Math.max(1000, 3 * thicknessMm);
/** Floor width taken for a ground floor when none is known, mm (ISO 10211, as recalled). */
export const GROUND_FLOOR_WIDTH_MM = 8000;
/** How far the ground extends beside and below the building: 2.5·b (ISO 10211, as recalled). */
export const GROUND_EXTENT_MM = 2.5 * GROUND_FLOOR_WIDTH_MM;

const r3 = (v: number): number => Math.round(v * 1000) / 1000;
const rect = (
	name: string,
	x0: number,
	x1: number,
	y0: number,
	y1: number,
	lambda: number
): JunctionRegion => ({
	name,
	x0: r3(Math.min(x0, x1)),
	x1: r3(Math.max(x0, x1)),
	y0: r3(Math.min(y0, y1)),
	y1: r3(Math.max(y0, y1)),
	lambda
});
export const seg = (from: Point, to: Point, environment: string): JunctionBoundary => ({
	from: [r3(from[0]), r3(from[1])],
	to: [r3(to[0]), r3(to[1])],
	environment
});
const same = (flanks: JunctionFlank[]): Record<DimensionSystem, JunctionFlank[]> => ({
	internal: flanks,
	'overall-internal': flanks,
	external: flanks
});
const flank = (e: ModelledElement, lengthMm: number): JunctionFlank => ({
	name: e.name,
	uValue: e.u,
	lengthMm: r3(lengthMm)
});

/**
 * Bands of an element's layers (inside to outside) across one axis, starting at `inner` and going
 * in `dir`, each spanning [lo, hi] along the other axis.
 */
export function bands(
	e: { name: string; layers: ModelLayer[] },
	inner: number,
	dir: 1 | -1,
	across: 'x' | 'y',
	lo: number,
	hi: number
): JunctionRegion[] {
	let at = inner;
	return e.layers.map((l) => {
		const next = at + dir * l.thicknessMm;
		const r =
			across === 'x'
				? rect(`${e.name}: ${l.name}`, at, next, lo, hi, l.lambda)
				: rect(`${e.name}: ${l.name}`, lo, hi, at, next, l.lambda);
		at = next;
		return r;
	});
}

/** A vertical wall with its outside face at x = 0 and inside face at x = t (inside to the right), from y0 to y1. */
const wallBands = (w: ModelledElement, y0: number, y1: number) => bands(w, w.thicknessMm, -1, 'x', y0, y1);

/** Insulation depth [from, to] of the first element, measured from its inside face. */
const insulationDepth = (e: ModelledElement) => layerDepth(e, e.insulation);

/** A plain wall running straight through: a reference whose ψ is zero. */
export function straightShape(w: ModelledElement, env: Envs): Shape {
	const t = w.thicknessMm;
	const l = cutOff(t);
	return {
		regions: wallBands(w, 0, 2 * l),
		boundaries: [seg([0, 0], [0, 2 * l], env.out(w)), seg([t, 0], [t, 2 * l], env.inside)],
		environments: env.all,
		flanks: same([flank(w, 2 * l)]),
		frame: { p0: [t, l], along: [0, 1], out: [-1, 0], range: [-l, l] },
		gapSpan: (g) => [-g / 2, g / 2],
		view: { x0: 0, y0: 0, x1: t, y1: 2 * l },
		notes: []
	};
}

/** Names and surface resistances of the environments a shape uses. */
export interface Envs {
	inside: string;
	/** the inside face of a window's panel */
	glazing: () => string;
	out: (e: ModelledElement) => string;
	/** an inside surface whose heat flows in a direction other than horizontal */
	insideAt: (direction: 'upward' | 'downward') => string;
	roofSpace: (e: ModelledElement) => string;
	all: Record<string, ShapeEnvironment>;
}

/**
 * Two walls meeting at a right angle, in plan. The first runs along x, the second along y; their
 * layers are listed from the face on the 270° side (outside for an external corner, inside for an
 * internal one). In the corner square the two meet on its diagonal, cell by cell: the cell where the
 * first wall's layer k crosses the second wall's layer m takes the first wall's material when its
 * centre lies on the first wall's side of the diagonal (y/ta ≤ x/tb), else the second's. For two
 * identical walls this is layer k wrapping round layer k + 1; swapping the walls mirrors the model.
 */
export function cornerShape(a: ModelledElement, b: ModelledElement, external: boolean, env: Envs): Shape {
	const pa = external ? [...a.layers].reverse() : a.layers;
	const pb = external ? [...b.layers].reverse() : b.layers;
	const offsets = (ls: ModelLayer[]) => ls.reduce((o, l) => [...o, o[o.length - 1] + l.thicknessMm], [0]);
	const oa = offsets(pa);
	const ob = offsets(pb);
	const ta = a.thicknessMm;
	const tb = b.thicknessMm;
	const la = cutOff(ta);
	const lb = cutOff(tb);
	const xEnd = tb + la;
	const yEnd = ta + lb;
	const firstWall = (k: number, m: number) => (oa[k] + oa[k + 1]) / 2 / ta <= (ob[m] + ob[m + 1]) / 2 / tb;
	/** where the first wall's layer k starts in x: the first cell of the corner square that is its */
	const edgeB = (k: number) => {
		const m = pb.findIndex((_, i) => firstWall(k, i));
		return m < 0 ? tb : ob[m];
	};
	/** where the second wall's layer m starts in y: the first cell that is not the first wall's */
	const edgeA = (m: number) => {
		const k = pa.findIndex((_, i) => !firstWall(i, m));
		return k < 0 ? ta : oa[k];
	};
	const regions = [
		...pa.map((l, k) => rect(`${a.name}: ${l.name}`, edgeB(k), xEnd, oa[k], oa[k + 1], l.lambda)),
		...pb.map((l, m) => rect(`${b.name}: ${l.name}`, ob[m], ob[m + 1], edgeA(m), yEnd, l.lambda))
	];
	const near = external ? [env.out(a), env.out(b)] : [env.inside, env.inside];
	const far = external ? [env.inside, env.inside] : [env.out(a), env.out(b)];
	const ka = external ? pa.length - 1 - a.insulation : a.insulation;
	const flanks = external
		? { inside: [flank(a, la), flank(b, lb)], outside: [flank(a, xEnd), flank(b, yEnd)] }
		: { inside: [flank(a, xEnd), flank(b, yEnd)], outside: [flank(a, la), flank(b, lb)] };
	return {
		regions,
		boundaries: [
			seg([0, 0], [xEnd, 0], near[0]),
			seg([0, 0], [0, yEnd], near[1]),
			seg([tb, ta], [xEnd, ta], far[0]),
			seg([tb, ta], [tb, yEnd], far[1])
		],
		environments: env.all,
		flanks: { internal: flanks.inside, 'overall-internal': flanks.inside, external: flanks.outside },
		frame: external
			? { p0: [0, ta], along: [1, 0], out: [0, -1], range: [0, xEnd] }
			: { p0: [0, 0], along: [1, 0], out: [0, 1], range: [0, xEnd] },
		gapSpan: (g) => [edgeB(ka), edgeB(ka) + g],
		view: { x0: 0, y0: 0, x1: xEnd, y1: yEnd },
		notes: []
	};
}
