/**
 * Junction types drawn as a section (or, for the party wall, a plan) through a wall whose outside
 * face is at x = 0 and inside face at x = t: floors, roofs, window reveals and the party wall.
 * Conventions as in ./builder-shapes.
 */
import { RSE, RSI, slabOnGroundU } from '$lib/physics';
import type { JunctionRegion } from '$lib/physics/junction-schema';
import { layerDepth, type ModelledElement } from './builder-layers';
import {
	bands,
	cutOff,
	GROUND_EXTENT_MM,
	GROUND_FLOOR_WIDTH_MM,
	seg,
	type Envs,
	type Shape
} from './builder-shapes';

const r3 = (v: number): number => Math.round(v * 1000) / 1000;
const region = (
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
const wallBands = (w: ModelledElement, y0: number, y1: number) => bands(w, w.thicknessMm, -1, 'x', y0, y1);
const flank = (name: string, uValue: number, lengthMm: number) => ({ name, uValue, lengthMm: r3(lengthMm) });
/** Depth of the inside face of the first element's main insulation, from its inside face. */
const toInsulation = (w: ModelledElement) => layerDepth(w, w.insulation)[0];

export interface GroundOptions {
	floorAboveGroundMm: number;
	wallBelowFloorMm: number;
	groundLambda: number;
}

/**
 * Wall on a floor on the ground (section). Ground level at y = 0; the floor's surface at
 * `floorAboveGroundMm`, its layers (top down) from the wall's inside face to the symmetry plane
 * b/2 away; the wall continues `wallBelowFloorMm` below the floor's underside into the ground. The
 * floor's flank is its ISO 13370 U for the model's floor (B′ = b, the wall's thickness as w).
 */
export function groundFloorShape(w: ModelledElement, f: ModelledElement, o: GroundOptions, env: Envs): Shape {
	const t = w.thicknessMm;
	const hF = o.floorAboveGroundMm;
	const under = hF - f.thicknessMm;
	const wallBottom = Math.min(under, 0) - o.wallBelowFloorMm;
	const lw = cutOff(t);
	const top = hF + lw;
	const half = GROUND_FLOOR_WIDTH_MM / 2;
	const xs = t + half;
	const g = GROUND_EXTENT_MM;
	const ground = slabOnGroundU(
		{
			areaM2: GROUND_FLOOR_WIDTH_MM / 1000,
			perimeterM: 2,
			groundLambda: o.groundLambda,
			wallThicknessM: t / 1000
		},
		RSI.downward,
		f.rLayers,
		RSE
	);
	const floorSurface = env.insideAt('downward');
	const regions = [
		region('Ground', -g, 0, -g, 0, o.groundLambda),
		region('Ground', 0, xs, -g, under, o.groundLambda),
		...wallBands(w, wallBottom, top),
		...bands(f, hF, -1, 'y', t, xs)
	];
	const internal = [flank(w.name, w.u, lw), flank(f.name, ground.u, half)];
	return {
		regions,
		boundaries: [
			seg([0, 0], [0, top], env.out(w)),
			seg([-g, 0], [0, 0], env.out(w)),
			seg([t, hF], [t, top], env.inside),
			seg([t, hF], [xs, hF], floorSurface)
		],
		environments: env.all,
		flanks: {
			internal,
			'overall-internal': internal,
			external: [flank(w.name, w.u, top - under), flank(f.name, ground.u, half + t)]
		},
		frame: { p0: [t, hF], along: [0, 1], out: [-1, 0], range: [wallBottom - hF, lw] },
		gapSpan: (gap) => [-gap, 0],
		view: { x0: -1200, y0: Math.min(wallBottom, under) - 1000, x1: t + 1800, y1: top },
		notes: [
			`The ground (λ ${o.groundLambda} W/(m·K)) extends ${g / 1000} m beside and below, and the floor to a symmetry plane ${half / 1000} m from the wall's inside face: a floor ${GROUND_FLOOR_WIDTH_MM / 1000} m wide (ISO 10211 for an unknown floor width, as recalled). The far edges of the ground and the symmetry plane are adiabatic.`,
			`Floor flank U = ${ground.u.toFixed(4)} W/(m²·K) by ISO 13370 for this floor (B′ = ${ground.characteristicDimensionM} m, dt = ${ground.equivalentThicknessM.toFixed(3)} m, w = ${(t / 1000).toFixed(3)} m): ψ refers to it, not to the dwelling's floor U.`,
			`Wall heights: internal and overall internal from the floor surface; external from the floor's underside (as recalled of ISO 13789). Floor widths: from the wall's inside face (internal) or outside face (external).`
		]
	};
}

/**
 * Wall at an intermediate floor (section): a slab of the given thickness and λ bears into the wall
 * up to its main insulation; both floors are inside, at the same temperature. The wall's flank is
 * measured without the slab (internal) or through it (overall internal, external).
 */
export function intermediateFloorShape(
	w: ModelledElement,
	slab: { thicknessMm: number; lambda: number },
	env: Envs
): Shape {
	const t = w.thicknessMm;
	const tf = slab.thicknessMm;
	const lw = cutOff(t);
	const ls = cutOff(tf);
	const bear = t - toInsulation(w);
	return {
		regions: [...wallBands(w, -lw, tf + lw), region('Floor slab', bear, t + ls, 0, tf, slab.lambda)],
		boundaries: [
			seg([0, -lw], [0, tf + lw], env.out(w)),
			seg([t, -lw], [t, 0], env.inside),
			seg([t, tf], [t, tf + lw], env.inside),
			seg([t, tf], [t + ls, tf], env.insideAt('downward')),
			seg([t, 0], [t + ls, 0], env.insideAt('upward'))
		],
		environments: env.all,
		flanks: {
			internal: [flank(w.name, w.u, 2 * lw)],
			'overall-internal': [flank(w.name, w.u, 2 * lw + tf)],
			external: [flank(w.name, w.u, 2 * lw + tf)]
		},
		frame: { p0: [t, tf / 2], along: [0, 1], out: [-1, 0], range: [-lw - tf / 2, lw + tf / 2] },
		gapSpan: (g) => [-g / 2, g / 2],
		view: { x0: 0, y0: -lw, x1: t + ls, y1: tf + lw },
		notes: [
			`The floor slab bears into the wall up to its main insulation (${bear.toFixed(0)} mm from the outside face); the rooms above and below are at the same temperature, so the slab is no flank.`
		]
	};
}

/**
 * Wall at a roof (section): a ceiling under a roof space, or a flat roof. The roof's layers (inside,
 * at the bottom, first) run from `overWallMm` inside the wall's inside face (over the wall head) into
 * the room; above them is the roof space (Rs = Rse + the roof space's resistance, ISO 6946) or the
 * outside.
 */
export function roofShape(
	w: ModelledElement,
	r: ModelledElement,
	overWallMm: number,
	loft: boolean,
	env: Envs
): Shape {
	const t = w.thicknessMm;
	const tr = r.thicknessMm;
	const lw = cutOff(t);
	const lr = cutOff(tr);
	const start = t - Math.min(Math.max(overWallMm, 0), t);
	const above = loft ? env.roofSpace(r) : env.out(r);
	const boundaries = [
		seg([0, -lw], [0, 0], env.out(w)),
		seg([start, 0], [start, tr], above),
		seg([start, tr], [t + lr, tr], above),
		seg([t, -lw], [t, 0], env.inside),
		seg([t, 0], [t + lr, 0], env.insideAt('upward'))
	];
	if (start > 0) boundaries.splice(1, 0, seg([0, 0], [start, 0], above));
	return {
		regions: [...wallBands(w, -lw, 0), ...bands(r, 0, 1, 'y', start, t + lr)],
		boundaries,
		environments: env.all,
		flanks: {
			internal: [flank(w.name, w.u, lw), flank(r.name, r.u, lr)],
			'overall-internal': [flank(w.name, w.u, lw), flank(r.name, r.u, lr)],
			external: [flank(w.name, w.u, lw + tr), flank(r.name, r.u, lr + t)]
		},
		frame: { p0: [t, 0], along: [0, -1], out: [-1, 0], range: [0, lw] },
		gapSpan: (g) => [0, g],
		view: { x0: 0, y0: -lw, x1: t + lr, y1: tr },
		notes: [
			`The ${loft ? 'ceiling' : 'roof'}'s layers run ${(t - start).toFixed(0)} mm over the wall head from its inside face${loft ? '; the roof space above is taken as outside air behind its ISO 6946 resistance, rafters and roof covering are not modelled' : ''}.`,
			'Lengths: internal below the ceiling and from the wall’s inside face; external to the top of the roof layers and from the wall’s outside face.'
		]
	};
}

export interface WindowOptions {
	/** the window's U, W/(m²·K): the panel's equivalent λ gives it */
	uWindow: number;
	thicknessMm: number;
	/** depth of the panel's inside face from the wall's inside face, mm */
	positionMm: number;
	/** head (wall above, opening below), jamb (plan) or sill (wall below, opening above) */
	at: 'head' | 'jamb' | 'sill';
}

/**
 * A window reveal: the wall ends at the opening, and a homogeneous panel whose λ reproduces the
 * window's U (λ = d/(1/U − Rsi − Rse)) continues in the opening at the given depth. Wall and panel
 * run to cut-off planes; the reveal faces inside and outside.
 */
export function windowShape(w: ModelledElement, o: WindowOptions, env: Envs): Shape {
	const t = w.thicknessMm;
	const lw = cutOff(t);
	const lp = cutOff(o.thicknessMm);
	const s = o.at === 'sill' ? -1 : 1;
	const inner = t - o.positionMm;
	const outer = inner - o.thicknessMm;
	const rPanel = 1 / o.uWindow - RSI.horizontal - RSE;
	const lambda = o.thicknessMm / 1000 / rPanel;
	const reveal =
		o.at === 'head' ? env.insideAt('upward') : o.at === 'sill' ? env.insideAt('downward') : env.inside;
	const boundaries = [
		seg([0, 0], [0, s * lw], env.out(w)),
		seg([t, 0], [t, s * lw], env.inside),
		seg([inner, 0], [inner, -s * lp], env.glazing()),
		seg([outer, 0], [outer, -s * lp], env.out(w))
	];
	if (inner < t) boundaries.push(seg([inner, 0], [t, 0], reveal));
	if (outer > 0) boundaries.push(seg([0, 0], [outer, 0], env.out(w)));
	const y0 = Math.min(0, s * lw);
	return {
		regions: [...wallBands(w, y0, y0 + lw), region('Window (panel)', outer, inner, 0, -s * lp, lambda)],
		boundaries,
		environments: env.all,
		flanks: {
			internal: [flank(w.name, w.u, lw), flank('Window (panel)', o.uWindow, lp)],
			'overall-internal': [flank(w.name, w.u, lw), flank('Window (panel)', o.uWindow, lp)],
			external: [flank(w.name, w.u, lw), flank('Window (panel)', o.uWindow, lp)]
		},
		frame: { p0: [t, 0], along: [0, s], out: [-1, 0], range: [0, lw] },
		gapSpan: (g) => [0, g],
		view: { x0: 0, y0: Math.min(-s * lp, s * lw), x1: t, y1: Math.max(-s * lp, s * lw) },
		notes: [
			`The window is a ${o.thicknessMm} mm panel of λ ${lambda.toFixed(4)} W/(m·K), which gives its U of ${o.uWindow} W/(m²·K) with Rsi ${RSI.horizontal} and Rse ${RSE}; its inside face ${o.positionMm} mm behind the wall's inside face. Frame and glazing edge are not modelled: ψ is that of the installation in the wall.`,
			`${o.at === 'jamb' ? 'A plan' : 'A section'}; the wall and panel lengths are measured from the plane of the reveal, the same in every dimension system.`
		]
	};
}

/**
 * A party wall meeting an external wall (plan): the external wall runs along x (outside face at
 * y = 0), the party wall along y, centred on x = 0, bearing into the external wall up to its main
 * insulation. Both dwellings are inside at the same temperature, so the party wall is no flank.
 */
export function partyWallShape(w: ModelledElement, p: ModelledElement, env: Envs): Shape {
	const t = w.thicknessMm;
	const tp = p.thicknessMm;
	const lw = cutOff(t);
	const lp = cutOff(tp);
	const x = tp / 2 + lw;
	const bear = t - toInsulation(w);
	return {
		regions: [...bands(w, t, -1, 'y', -x, x), ...bands(p, -tp / 2, 1, 'x', bear, t + lp)],
		boundaries: [
			seg([-x, 0], [x, 0], env.out(w)),
			seg([-x, t], [-tp / 2, t], env.inside),
			seg([tp / 2, t], [x, t], env.inside),
			seg([-tp / 2, t], [-tp / 2, t + lp], env.inside),
			seg([tp / 2, t], [tp / 2, t + lp], env.inside)
		],
		environments: env.all,
		flanks: {
			internal: [flank(w.name, w.u, 2 * lw)],
			'overall-internal': [flank(w.name, w.u, 2 * lw + tp)],
			external: [flank(w.name, w.u, 2 * lw + tp)]
		},
		frame: { p0: [0, t], along: [1, 0], out: [0, -1], range: [-x, x] },
		gapSpan: (g) => [-g / 2, g / 2],
		view: { x0: -x, y0: 0, x1: x, y1: t + lp },
		notes: [
			`The party wall bears into the external wall up to its main insulation (${bear.toFixed(0)} mm from the outside face); both dwellings are at the same temperature, so the party wall is no flank.`
		]
	};
}
