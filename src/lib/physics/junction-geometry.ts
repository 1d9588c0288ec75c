/**
 * The geometry of a junction model as blocks: the grid made by every region edge and every
 * boundary-segment end (the "key lines"), the material of each block (the last region that covers
 * it; none where no region lies), and each boundary segment as a run of block edges. Checks that
 * need the geometry as a whole live here too: a boundary lies on the outer edge of the material,
 * no two boundaries share an edge, every piece of material has a boundary, probes lie in material.
 */
import type { FieldIssue } from './schema';
import type { JunctionInput } from './junction-schema';
import { JUNCTION_BLOCKS_MAX, JUNCTION_RS_NEGLIGIBLE } from './junction-bounds';

/** A boundary segment along a key line: horizontal at ky[line] over kx[from..to], or vertical. */
export interface Segment {
	boundary: number;
	horizontal: boolean;
	line: number;
	from: number;
	to: number;
	env: number;
}

export interface BlockModel {
	kx: Float64Array;
	ky: Float64Array;
	/** blocks in x and y (key lines − 1) */
	bx: number;
	by: number;
	/** region index of each block (row-major, y outer), −1 where there is no material */
	mat: Int32Array;
	lambda: Float64Array;
	envNames: string[];
	envTemperature: Float64Array;
	/** surface resistance; 0 (fixed temperature) where the input's is below JUNCTION_RS_NEGLIGIBLE */
	envRs: Float64Array;
	segments: Segment[];
	/** environments whose small but positive Rs was taken as zero */
	rsTakenAsZero: string[];
}

/** Integer key of a coordinate on the 0.001 mm step (./junction-bounds JUNCTION_COORD_STEP_MM). */
export const coordKey = (v: number): number => Math.round(v * 1000);
const snap = (v: number): number => coordKey(v) / 1000;

function keyLines(values: number[]): { lines: Float64Array; index: Map<number, number> } {
	const keys = [...new Set(values.map(coordKey))].sort((a, b) => a - b);
	const index = new Map<number, number>();
	keys.forEach((k, i) => index.set(k, i));
	return { lines: Float64Array.from(keys, (k) => k / 1000), index };
}

/** Paint the regions in order onto the blocks (a later region overrides an earlier one). */
function paint(
	input: JunctionInput,
	ix: Map<number, number>,
	iy: Map<number, number>,
	bx: number,
	by: number
) {
	const mat = new Int32Array(bx * by).fill(-1);
	input.regions.forEach((r, n) => {
		const i0 = ix.get(coordKey(r.x0))!;
		const i1 = ix.get(coordKey(r.x1))!;
		const j0 = iy.get(coordKey(r.y0))!;
		const j1 = iy.get(coordKey(r.y1))!;
		for (let j = j0; j < j1; j++) mat.fill(n, j * bx + i0, j * bx + i1);
	});
	return mat;
}

const at = (m: BlockModel, i: number, j: number): number =>
	i < 0 || j < 0 || i >= m.bx || j >= m.by ? -1 : m.mat[j * m.bx + i];

/** Region on each side of block edge k of a segment: below/above (horizontal) or left/right. */
export function sidesOf(m: BlockModel, s: Segment, k: number): [number, number] {
	return s.horizontal ? [at(m, k, s.line - 1), at(m, k, s.line)] : [at(m, s.line - 1, k), at(m, s.line, k)];
}

function toSegment(
	input: JunctionInput,
	b: number,
	ix: Map<number, number>,
	iy: Map<number, number>,
	env: number
) {
	const { from, to } = input.boundaries[b];
	const horizontal = coordKey(from[1]) === coordKey(to[1]);
	const along = horizontal ? ix : iy;
	const a = along.get(coordKey(horizontal ? from[0] : from[1]))!;
	const c = along.get(coordKey(horizontal ? to[0] : to[1]))!;
	const line = (horizontal ? iy : ix).get(coordKey(horizontal ? from[1] : from[0]))!;
	return { boundary: b, horizontal, line, from: Math.min(a, c), to: Math.max(a, c), env };
}

/**
 * The block model of a validated input, or issues when the key lines make too many blocks. The
 * geometric checks (`geometryIssues`) are separate, so that the mesh can trust a checked model.
 */
export function buildBlocks(input: JunctionInput): { model: BlockModel } | { issues: FieldIssue[] } {
	const xs = input.regions
		.flatMap((r) => [r.x0, r.x1])
		.concat(input.boundaries.flatMap((b) => [b.from[0], b.to[0]]));
	const ys = input.regions
		.flatMap((r) => [r.y0, r.y1])
		.concat(input.boundaries.flatMap((b) => [b.from[1], b.to[1]]));
	const kx = keyLines(xs);
	const ky = keyLines(ys);
	const bx = kx.lines.length - 1;
	const by = ky.lines.length - 1;
	if (bx * by > JUNCTION_BLOCKS_MAX)
		return {
			issues: [
				{
					path: 'regions',
					message: `The edges of the regions and boundaries divide the model into ${bx * by} blocks, more than the ${JUNCTION_BLOCKS_MAX} allowed: use fewer distinct coordinates`
				}
			]
		};
	const envNames = Object.keys(input.environments);
	const envIndex = new Map(envNames.map((n, i) => [n, i]));
	const rs = envNames.map((n) => input.environments[n].rs);
	const model: BlockModel = {
		kx: kx.lines,
		ky: ky.lines,
		bx,
		by,
		mat: paint(input, kx.index, ky.index, bx, by),
		lambda: Float64Array.from(input.regions, (r) => r.lambda),
		envNames,
		envTemperature: Float64Array.from(envNames, (n) => input.environments[n].temperature),
		envRs: Float64Array.from(rs, (v) => (v < JUNCTION_RS_NEGLIGIBLE ? 0 : v)),
		segments: input.boundaries.map((_, b) =>
			toSegment(input, b, kx.index, ky.index, envIndex.get(input.boundaries[b].environment)!)
		),
		rsTakenAsZero: envNames.filter((_, i) => rs[i] > 0 && rs[i] < JUNCTION_RS_NEGLIGIBLE)
	};
	return { model };
}

const mm = (v: number): string => String(snap(v));

function segmentText(m: BlockModel, s: Segment, k0: number, k1: number): string {
	const along = s.horizontal ? m.kx : m.ky;
	const at = (s.horizontal ? m.ky : m.kx)[s.line];
	return s.horizontal
		? `from (${mm(along[k0])}, ${mm(at)}) to (${mm(along[k1])}, ${mm(at)}) mm`
		: `from (${mm(at)}, ${mm(along[k0])}) to (${mm(at)}, ${mm(along[k1])}) mm`;
}

/** Issues of one segment: each block edge has material on exactly one side, and no other boundary. */
function segmentIssues(m: BlockModel, s: Segment, owner: Int32Array, hCount: number): FieldIssue[] {
	const path = `boundaries.${s.boundary}`;
	for (let k = s.from; k < s.to; k++) {
		const [a, b] = sidesOf(m, s, k);
		if (a >= 0 === b >= 0) {
			const why = a >= 0 ? 'it has material on both sides' : 'there is no material on either side';
			return [
				{
					path,
					message: `Boundary ${s.boundary + 1} does not lie on the edge of the material: ${segmentText(m, s, k, k + 1)} ${why}`
				}
			];
		}
		const slot = s.horizontal ? s.line * m.bx + k : hCount + s.line * m.by + k;
		if (owner[slot] >= 0)
			return [
				{
					path,
					message: `Boundary ${s.boundary + 1} overlaps boundary ${owner[slot] + 1} ${segmentText(m, s, k, k + 1)}: an edge faces one environment only`
				}
			];
		owner[slot] = s.boundary;
	}
	return [];
}

/** Label every block with its piece of material (blocks that share an edge or a corner join). */
function pieces(m: BlockModel): { label: Int32Array; count: number } {
	const label = new Int32Array(m.bx * m.by).fill(-1);
	const stack: number[] = [];
	let count = 0;
	for (let start = 0; start < label.length; start++) {
		if (m.mat[start] < 0 || label[start] >= 0) continue;
		label[start] = count;
		stack.push(start);
		while (stack.length) {
			const b = stack.pop()!;
			const i = b % m.bx;
			const j = (b - i) / m.bx;
			for (let dj = -1; dj <= 1; dj++)
				for (let di = -1; di <= 1; di++) {
					if (at(m, i + di, j + dj) < 0) continue;
					const nb = (j + dj) * m.bx + i + di;
					if (label[nb] < 0) {
						label[nb] = count;
						stack.push(nb);
					}
				}
		}
		count++;
	}
	return { label, count };
}

/** A piece of material that no boundary touches has no defined temperature. */
function pieceIssues(m: BlockModel): FieldIssue[] {
	const { label, count } = pieces(m);
	const exposed = new Uint8Array(count);
	for (const s of m.segments)
		for (let k = s.from; k < s.to; k++) {
			const [a, b] = sidesOf(m, s, k);
			const i = s.horizontal ? k : a >= 0 ? s.line - 1 : s.line;
			const j = s.horizontal ? (a >= 0 ? s.line - 1 : s.line) : k;
			if (a >= 0 || b >= 0) exposed[label[j * m.bx + i]] = 1;
		}
	const issues: FieldIssue[] = [];
	for (let p = 0; p < count; p++) {
		if (exposed[p]) continue;
		const block = label.indexOf(p);
		const r = m.mat[block];
		issues.push({
			path: `regions.${r}`,
			message: `Region ${r + 1} belongs to a piece of material that no boundary touches, so its temperature is undefined: join it to the rest or give it a boundary`
		});
	}
	return issues;
}

/** Region at a point (mm), or −1; a point on an edge between blocks belongs to either. */
export function regionAt(m: BlockModel, x: number, y: number): number {
	const ci = candidates(m.kx, x);
	const cj = candidates(m.ky, y);
	for (const j of cj) for (const i of ci) if (at(m, i, j) >= 0) return at(m, i, j);
	return -1;
}

/** Intervals of sorted `lines` that hold v (two when v lies on a line); none outside. */
export function candidates(lines: Float64Array, v: number): number[] {
	const n = lines.length - 1;
	if (!(v >= lines[0] && v <= lines[n])) return [];
	let lo = 0;
	let hi = n;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (lines[mid] <= v) lo = mid;
		else hi = mid;
	}
	const out = [lo];
	if (v === lines[lo] && lo > 0) out.push(lo - 1);
	if (v === lines[lo + 1] && lo + 1 < n) out.push(lo + 1);
	return out;
}

/** The checks that need the geometry as a whole, each naming its item. */
export function geometryIssues(input: JunctionInput, m: BlockModel): FieldIssue[] {
	const hCount = m.ky.length * m.bx;
	const owner = new Int32Array(hCount + m.kx.length * m.by).fill(-1);
	const issues = m.segments.flatMap((s) => segmentIssues(m, s, owner, hCount));
	if (issues.length === 0) issues.push(...pieceIssues(m));
	(input.probes ?? []).forEach((p, i) => {
		if (regionAt(m, p[0], p[1]) < 0)
			issues.push({
				path: `probes.${i}`,
				message: `Probe ${i + 1} at (${mm(p[0])}, ${mm(p[1])}) mm lies outside the material`
			});
	});
	return issues;
}
