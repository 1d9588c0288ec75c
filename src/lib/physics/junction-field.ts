/**
 * The temperature field of a junction (ISO 10211) for pictures: one solve, as `analyseJunction`
 * refines it, and the solved node temperatures on a subset of the final mesh's grid lines inside a
 * window (every key line kept, so region edges and surfaces are sample lines; other lines thinned
 * to a spacing of at least the window's extent / `maxLines`). With the field come the figures of
 * the same solve that a picture marks: the temperature factor fRsi, the coldest surface point, the
 * heat flows and L2D. ψ, notes and cautions stay `analyseJunction`'s.
 *
 * A wrapper of ./junction's exported steps; nothing here changes how a junction is solved.
 */
import type { JunctionInput } from './junction-schema';
import { JunctionInputError, parseJunctionInput } from './junction-parse';
import { refine } from './junction';
import { temperatureGroups } from './junction-post';
import { cellRegion, type BoundaryEdges, type Mesh } from './junction-mesh';
import type { BlockModel } from './junction-geometry';

/**
 * The coldest node on the edges of the named environments (all of the warmest temperature when
 * none are named), and fRsi = (θsi,min − θe)/(θi − θe) with θi the warmest and θe the coldest
 * temperature (ISO 10211, ISO 13788). The field is linear along an edge, so its lowest value is at a node.
 */
export function surfaceMinimumOf(
	b: BlockModel,
	m: Mesh,
	e: BoundaryEdges,
	temperature: Float64Array,
	environments?: readonly string[]
) {
	const g = temperatureGroups(b);
	const named = environments ? new Set(environments.map((n) => b.envNames.indexOf(n))) : null;
	let best = -1;
	for (let k = 0; k < e.count; k++) {
		const env = e.env[k];
		if (named ? !named.has(env) : b.envTemperature[env] !== g.warm) continue;
		for (const n of [e.a[k], e.b[k]]) if (best < 0 || temperature[n] < temperature[best]) best = n;
	}
	if (best < 0) return null;
	const t = temperature[best];
	return {
		fRsi: (t - g.cold) / (g.warm - g.cold),
		coldest: { x: m.xs[m.nodeI[best]], y: m.ys[m.nodeJ[best]], temperature: t }
	};
}

/** Where and how finely to sample: a window in model coordinates (mm), and at most this many lines an axis. */
export interface FieldSampling {
	window?: { x0: number; y0: number; x1: number; y1: number };
	/** lines an axis besides the key lines (default 120, at most 400) */
	maxLines?: number;
}

/** Temperatures (°C) at the grid points xs × ys (row-major, y outer); null outside the material. */
export interface JunctionField {
	xs: number[];
	ys: number[];
	values: (number | null)[];
	/** per cell ((xs.length − 1)·(ys.length − 1), y outer): its region index, −1 where there is no material */
	cells: number[];
}

export interface JunctionFieldResult {
	heatFlows: Record<string, number>;
	couplingCoefficient: number;
	/** over the surfaces of `surfaceEnvironments` (else of the warmest environments); null when none faces the model */
	fRsi: number | null;
	coldest: { x: number; y: number; temperature: number } | null;
	mesh: { nodes: number; maxCellMm: number; refinementChange: number };
	converged: boolean;
	field?: JunctionField;
}

const MAX_LINES_DEFAULT = 120;
const MAX_LINES_CAP = 400;

/**
 * Indices of the mesh lines `lines` kept to cover [lo, hi]: from the last line at or before lo to
 * the first at or after hi (so the samples cover the window), every key line (`keyIndex`) among them,
 * and others at least (hi − lo)/maxLines from the last kept one.
 */
export function thinLines(
	lines: Float64Array,
	keyIndex: Int32Array,
	lo: number,
	hi: number,
	maxLines: number
): number[] {
	const key = new Set(keyIndex);
	const step = (hi - lo) / maxLines;
	let first = 0;
	while (first + 1 < lines.length && lines[first + 1] <= lo) first++;
	let last = lines.length - 1;
	while (last - 1 >= 0 && lines[last - 1] >= hi) last--;
	const out: number[] = [];
	let at = -Infinity;
	for (let i = first; i <= last; i++) {
		if (i === first || i === last || key.has(i) || lines[i] - at >= step) {
			out.push(i);
			at = lines[i];
		}
	}
	return out;
}

/** The region of the material in the cell of the thinned grid between lines (i0..i1) × (j0..j1), at its centre. */
function cellOf(b: BlockModel, m: Mesh, i0: number, i1: number, j0: number, j1: number): number {
	return cellRegion(b, m, (i0 + i1 - 1) >> 1, (j0 + j1 - 1) >> 1);
}

function sample(b: BlockModel, m: Mesh, temperature: Float64Array, s: FieldSampling): JunctionField {
	const w = s.window ?? { x0: m.xs[0], y0: m.ys[0], x1: m.xs[m.nx], y1: m.ys[m.ny] };
	const maxLines = Math.min(MAX_LINES_CAP, Math.max(2, Math.round(s.maxLines ?? MAX_LINES_DEFAULT)));
	const ix = thinLines(m.xs, m.lineOfKeyX, w.x0, w.x1, maxLines);
	const iy = thinLines(m.ys, m.lineOfKeyY, w.y0, w.y1, maxLines);
	const values: (number | null)[] = [];
	for (const j of iy)
		for (const i of ix) {
			const n = m.node[j * (m.nx + 1) + i];
			values.push(n >= 0 ? temperature[n] : null);
		}
	const cells: number[] = [];
	for (let a = 0; a + 1 < iy.length; a++)
		for (let c = 0; c + 1 < ix.length; c++) cells.push(cellOf(b, m, ix[c], ix[c + 1], iy[a], iy[a + 1]));
	return { xs: ix.map((i) => m.xs[i]), ys: iy.map((j) => m.ys[j]), values, cells };
}

/**
 * Solve a junction once and return fRsi and the coldest point over the surfaces of
 * `surfaceEnvironments` (else of the warmest environments), heat flows, L2D and, with `sampleField`,
 * its temperature field (ISO 10211). Throws {@link JunctionInputError} as
 * `analyseJunction` does.
 */
export function analyseJunctionField(
	input: JunctionInput,
	options: { sampleField?: FieldSampling; surfaceEnvironments?: readonly string[] } = {}
): JunctionFieldResult {
	const parsed = parseJunctionInput(input);
	if (!parsed.ok) throw new JunctionInputError(parsed.issues);
	const { data, blocks: b } = parsed;
	const run = refine(b, data.maxCellMm);
	const f = run.final;
	const temperature = f.rel.map((t) => t + f.reference);
	const heatFlows: Record<string, number> = {};
	b.envNames.forEach((n, i) => (heatFlows[n] = f.flows[i]));
	return {
		heatFlows,
		couplingCoefficient: f.l2d,
		...(surfaceMinimumOf(b, f.mesh, f.edges, temperature, options.surfaceEnvironments) ?? {
			fRsi: null,
			coldest: null
		}),
		mesh: {
			nodes: f.mesh.nodeCount,
			maxCellMm: f.mesh.maxCellMm,
			refinementChange: run.levels[run.levels.length - 1].change
		},
		converged: run.met && f.pcg.converged,
		...(options.sampleField ? { field: sample(b, f.mesh, temperature, options.sampleField) } : {})
	};
}
