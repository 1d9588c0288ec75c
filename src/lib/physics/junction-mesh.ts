/**
 * The rectilinear mesh of a junction model at one refinement level. Every key line (region edge,
 * boundary-segment end) is a grid line. The cell size follows a size function that is smallest at
 * the key lines and grows geometrically away from them (ratio JUNCTION_GROWTH) up to the coarse
 * size h: at a key line it starts from the smaller of h·JUNCTION_END_FRACTION and the neighbouring
 * intervals' lengths, so cells are small at edges and corners and beside thin layers. Each
 * interval holds n cells at level 0 (n = ⌈∫dx/size⌉) placed at equal steps of ∫dx/size, and
 * n·2^level at a level; halving the mesh thus keeps every grid line of the previous mesh exactly
 * (the meshes are nested). A grid point is a node when a cell of material touches it.
 */
import type { BlockModel } from './junction-geometry';
import {
	JUNCTION_COARSE_DIVISIONS,
	JUNCTION_END_FRACTION,
	JUNCTION_GROWTH,
	JUNCTION_GRID_POINTS_MAX,
	JUNCTION_NODES_MAX
} from './junction-bounds';

export interface Mesh {
	level: number;
	/** grid lines, mm */
	xs: Float64Array;
	ys: Float64Array;
	/** cells in x and y */
	nx: number;
	ny: number;
	/** block column of each cell column, block row of each cell row */
	cellBlockX: Int32Array;
	cellBlockY: Int32Array;
	/** grid line of each key line */
	lineOfKeyX: Int32Array;
	lineOfKeyY: Int32Array;
	/** node id of each grid point ((nx + 1)·(ny + 1), y outer), −1 outside the material */
	node: Int32Array;
	nodeCount: number;
	/** grid column and row of each node */
	nodeI: Int32Array;
	nodeJ: Int32Array;
	/** the largest cell side, mm */
	maxCellMm: number;
}

/** Region index of cell (i, j), −1 where there is no material. */
export const cellRegion = (b: BlockModel, m: Mesh, i: number, j: number): number =>
	b.mat[m.cellBlockY[j] * b.bx + m.cellBlockX[i]];

/**
 * The map from ξ ∈ [0, 1] (equal steps of ∫dx/size) to x in [a, b], for the size function
 * min(h, da + (g − 1)(x − a), db + (g − 1)(b − x)), g the growth ratio: a ramp up from a, a plateau
 * at h, a ramp down to b, each integrated and inverted in closed form.
 */
export interface IntervalMap {
	/** ∫dx/size over the interval: its cell count at level 0 is ⌈total⌉ */
	total: number;
	at(xi: number): number;
}

export function intervalMap(a: number, b: number, da: number, db: number, h: number): IntervalMap {
	const k = JUNCTION_GROWTH - 1;
	const meet = Math.min(b, Math.max(a, (db - da + k * (a + b)) / (2 * k)));
	const x1 = Math.min(a + (h - da) / k, meet);
	const x2 = Math.max(b - (h - db) / k, meet);
	const rampA = Math.log((da + k * (x1 - a)) / da) / k;
	const flat = Math.max(0, x2 - x1) / h;
	const rampB = Math.log((db + k * (b - x2)) / db) / k;
	const total = rampA + flat + rampB;
	return {
		total,
		at(xi) {
			const f = xi * total;
			let x: number;
			if (f <= rampA) x = a + (da * (Math.exp(k * f) - 1)) / k;
			else if (f <= rampA + flat) x = x1 + (f - rampA) * h;
			else x = b - (db * (Math.exp(k * (total - f)) - 1)) / k;
			return Math.min(b, Math.max(a, x));
		}
	};
}

/** Size at each key line: h·END_FRACTION or the shortest interval beside it, whichever is smaller. */
function endSizes(k: Float64Array, h: number): Float64Array {
	return Float64Array.from(k, (_, i) => {
		let d = h * JUNCTION_END_FRACTION;
		if (i > 0) d = Math.min(d, k[i] - k[i - 1]);
		if (i < k.length - 1) d = Math.min(d, k[i + 1] - k[i]);
		return d;
	});
}

/** The maps and level-0 cell counts of every interval of an axis. */
export interface AxisDivision {
	maps: IntervalMap[];
	count: Int32Array;
}

function divideAxis(k: Float64Array, h: number): AxisDivision {
	const d = endSizes(k, h);
	const maps = Array.from({ length: k.length - 1 }, (_, i) => intervalMap(k[i], k[i + 1], d[i], d[i + 1], h));
	return { maps, count: Int32Array.from(maps, (m) => Math.max(1, Math.ceil(m.total - 1e-9))) };
}

/**
 * Divisions of the coarsest mesh (level 0): no cell exceeds h, the model's larger extent / 16 or
 * `maxCellMm` if smaller.
 */
export function coarseDivisions(b: BlockModel, maxCellMm?: number): { x: AxisDivision; y: AxisDivision } {
	const extent = Math.max(b.kx[b.bx] - b.kx[0], b.ky[b.by] - b.ky[0]);
	const h = Math.min(maxCellMm ?? Infinity, extent / JUNCTION_COARSE_DIVISIONS);
	return { x: divideAxis(b.kx, h), y: divideAxis(b.ky, h) };
}

const cellsAt = (div: AxisDivision, level: number): number =>
	div.count.reduce((s, n) => s + n, 0) * 2 ** level;

/** Grid points (inside and outside the material) of a level, known before anything is allocated. */
export function gridPointsAt(div: { x: AxisDivision; y: AxisDivision }, level: number): number {
	return (cellsAt(div.x, level) + 1) * (cellsAt(div.y, level) + 1);
}

function axis(k: Float64Array, div: AxisDivision, level: number) {
	const cells = cellsAt(div, level);
	const lines = new Float64Array(cells + 1);
	const block = new Int32Array(cells);
	const lineOfKey = new Int32Array(k.length);
	let g = 0;
	for (let i = 0; i < div.count.length; i++) {
		const n = div.count[i] * 2 ** level;
		lineOfKey[i] = g;
		for (let c = 0; c < n; c++) {
			lines[g] = c === 0 ? k[i] : div.maps[i].at(c / n);
			block[g++] = i;
		}
	}
	lines[cells] = k[k.length - 1];
	lineOfKey[k.length - 1] = cells;
	let widest = 0;
	for (let c = 0; c < cells; c++) widest = Math.max(widest, lines[c + 1] - lines[c]);
	return { lines, block, lineOfKey, widest };
}

/**
 * The mesh of one level, or null when it would exceed the grid-point or node cap
 * (JUNCTION_GRID_POINTS_MAX, JUNCTION_NODES_MAX).
 */
export function buildMesh(
	b: BlockModel,
	div: { x: AxisDivision; y: AxisDivision },
	level: number
): Mesh | null {
	if (gridPointsAt(div, level) > JUNCTION_GRID_POINTS_MAX) return null;
	const ax = axis(b.kx, div.x, level);
	const ay = axis(b.ky, div.y, level);
	const nx = ax.block.length;
	const ny = ay.block.length;
	const node = new Int32Array((nx + 1) * (ny + 1)).fill(-1);
	const m: Mesh = {
		level,
		xs: ax.lines,
		ys: ay.lines,
		nx,
		ny,
		cellBlockX: ax.block,
		cellBlockY: ay.block,
		lineOfKeyX: ax.lineOfKey,
		lineOfKeyY: ay.lineOfKey,
		node,
		nodeCount: 0,
		nodeI: new Int32Array(0),
		nodeJ: new Int32Array(0),
		maxCellMm: Math.max(ax.widest, ay.widest)
	};
	let count = 0;
	for (let j = 0; j <= ny; j++)
		for (let i = 0; i <= nx; i++) {
			if (touchesMaterial(b, m, i, j)) {
				node[j * (nx + 1) + i] = count++;
				if (count > JUNCTION_NODES_MAX) return null;
			}
		}
	m.nodeCount = count;
	m.nodeI = new Int32Array(count);
	m.nodeJ = new Int32Array(count);
	for (let p = 0; p < node.length; p++)
		if (node[p] >= 0) {
			m.nodeI[node[p]] = p % (nx + 1);
			m.nodeJ[node[p]] = Math.floor(p / (nx + 1));
		}
	return m;
}

function touchesMaterial(b: BlockModel, m: Mesh, i: number, j: number): boolean {
	for (let dj = -1; dj <= 0; dj++)
		for (let di = -1; di <= 0; di++) {
			const ci = i + di;
			const cj = j + dj;
			if (ci >= 0 && cj >= 0 && ci < m.nx && cj < m.ny && cellRegion(b, m, ci, cj) >= 0) return true;
		}
	return false;
}

/** The boundary edges of a mesh: end nodes, length (mm) and environment of each. */
export interface BoundaryEdges {
	count: number;
	a: Int32Array;
	b: Int32Array;
	lengthMm: Float64Array;
	env: Int32Array;
}

/** Each boundary segment as the mesh edges along it. */
export function boundaryEdges(b: BlockModel, m: Mesh): BoundaryEdges {
	let count = 0;
	const spans = b.segments.map((s) => {
		const lines = s.horizontal ? m.lineOfKeyX : m.lineOfKeyY;
		const span = {
			s,
			g0: lines[s.from],
			g1: lines[s.to],
			at: (s.horizontal ? m.lineOfKeyY : m.lineOfKeyX)[s.line]
		};
		count += span.g1 - span.g0;
		return span;
	});
	const e: BoundaryEdges = {
		count,
		a: new Int32Array(count),
		b: new Int32Array(count),
		lengthMm: new Float64Array(count),
		env: new Int32Array(count)
	};
	let k = 0;
	const w = m.nx + 1;
	for (const { s, g0, g1, at } of spans)
		for (let g = g0; g < g1; g++, k++) {
			e.a[k] = s.horizontal ? m.node[at * w + g] : m.node[g * w + at];
			e.b[k] = s.horizontal ? m.node[at * w + g + 1] : m.node[(g + 1) * w + at];
			e.lengthMm[k] = s.horizontal ? m.xs[g + 1] - m.xs[g] : m.ys[g + 1] - m.ys[g];
			e.env[k] = s.env;
		}
	return e;
}
