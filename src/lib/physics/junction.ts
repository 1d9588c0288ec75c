/**
 * Two-dimensional junction calculation (ISO 10211): steady-state heat conduction through a
 * cross-section of rectangular regions of material, exposed to environments along segments of its
 * edge. Gives the heat flow from each environment, the coupling coefficient L2D, the linear
 * thermal transmittance ψ = L2D − Σ U·l, the temperature factor fRsi, the coldest surface point
 * and temperatures at probe points. Pure TypeScript (no DOM, no Node APIs), usable in a Web Worker.
 *
 * Steps: ./junction-parse (validation) → ./junction-geometry (blocks) → ./junction-mesh (nested,
 * graded meshes) → ./junction-assemble (bilinear elements, Robin and fixed boundaries) →
 * ./junction-sparse and ./junction-multigrid (conjugate gradients preconditioned by a multigrid
 * V-cycle over the nested meshes) → ./junction-post (heat flows,
 * fRsi, probes), refined until halving the mesh changes L2D by no more than ISO 10211's criterion.
 */
import type { BlockModel } from './junction-geometry';
import type { JunctionInput } from './junction-schema';
import { buildMesh, boundaryEdges, coarseDivisions, type Mesh } from './junction-mesh';
import { assemble, constraints, type Constraints } from './junction-assemble';
import { solvePcg, type PcgResult, type Preconditioner } from './junction-sparse';
import { buildProlongation, multigrid, type MultigridLevel } from './junction-multigrid';
import {
	couplingCoefficient,
	heatFlows,
	prolong,
	surfaceMinimum,
	temperatureGroups,
	valueAt
} from './junction-post';
import { JunctionInputError, parseJunctionInput } from './junction-parse';
import {
	JUNCTION_MIN_LEVEL,
	JUNCTION_REFINEMENT_CRITERION,
	JUNCTION_SOLVER_MAX_ITERATIONS,
	JUNCTION_SOLVER_TOLERANCE
} from './junction-bounds';
import {
	CAUTION_FIXED_CONFLICT,
	CAUTION_MANY_TEMPERATURES,
	JUNCTION_CAUTIONS,
	cautionNotMet,
	cautionSolver,
	methodText
} from './junction-text';
import { fmt } from './note-format';

export type { JunctionInput } from './junction-schema';

export interface JunctionLevel {
	level: number;
	nodes: number;
	maxCellMm: number;
	couplingCoefficient: number;
	/** relative change of L2D from the previous level (0 for the first) */
	change: number;
	iterations: number;
}

export interface JunctionResult {
	/** W/m entering the model from each environment (positive in) */
	heatFlows: Record<string, number>;
	/** L2D, W/(m·K) */
	couplingCoefficient: number;
	/** L2D − Σ U·l, W/(m·K), when flanks are given */
	psi?: number;
	/** Σ U·l of the flanks, W/(m·K), when flanks are given */
	flankSum?: number;
	/** lowest (θsi − θe)/(θi − θe) over the surfaces of the warmest environment */
	fRsi: number;
	/** the coldest point of those surfaces (mm, °C) */
	coldest: { x: number; y: number; temperature: number };
	/** °C at the probe points */
	probes?: number[];
	mesh: { nodes: number; maxCellMm: number; refinementChange: number };
	convergence: { criterion: number; met: boolean; levels: JunctionLevel[] };
	solver: {
		preconditioner: Preconditioner['kind'];
		iterations: number;
		relativeResidual: number;
		converged: boolean;
		/** Σ of the heat flows over the largest of them (0 for an exact balance) */
		heatBalance: number;
	};
	method: string[];
	cautions: string[];
	notes: string[];
}

/** One level's solution: the mesh, temperatures relative to `reference` at its nodes, the heat flows. */
export interface LevelSolution {
	mesh: Mesh;
	c: Constraints;
	/** this level as a level of the multigrid hierarchy (matrix, slots, prolongation from the previous) */
	mg: MultigridLevel;
	rel: Float64Array;
	reference: number;
	flows: Float64Array;
	l2d: number;
	pcg: PcgResult;
	preconditioner: Preconditioner['kind'];
	fixedConflict: boolean;
	edges: ReturnType<typeof boundaryEdges>;
}

/**
 * Solve one refinement level (null when its mesh exceeds the node cap): conjugate gradients
 * preconditioned by a multigrid V-cycle over this and the coarser levels in `chain` (coarsest
 * first), starting from the previous level's field where there is one.
 */
export function solveLevel(
	b: BlockModel,
	div: ReturnType<typeof coarseDivisions>,
	level: number,
	chain: LevelSolution[]
): LevelSolution | null {
	const mesh = buildMesh(b, div, level);
	if (!mesh) return null;
	const edges = boundaryEdges(b, mesh);
	const c = constraints(b, mesh, edges);
	const groups = temperatureGroups(b);
	const sys = assemble(b, mesh, edges, c, groups.cold);
	const previous = chain[chain.length - 1];
	const mg: MultigridLevel = {
		mesh,
		c,
		a: sys.a,
		slot: sys.slot,
		p: previous ? buildProlongation(b, previous.mesh, previous.c, mesh, c) : undefined
	};
	const x = new Float64Array(c.freeCount);
	if (previous) prolong(b, previous.mesh, previous.rel, mesh, c, x);
	else x.fill((groups.warm - groups.cold) / 2);
	const pre = multigrid([...chain.map((l) => l.mg), mg]);
	const pcg = solvePcg(sys.a, sys.b, x, pre, {
		tolerance: JUNCTION_SOLVER_TOLERANCE,
		maxIterations: JUNCTION_SOLVER_MAX_ITERATIONS
	});
	const rel = Float64Array.from(sys.fixedValue);
	for (let r = 0; r < c.freeCount; r++) rel[c.freeNode[r]] = x[r];
	const flows = heatFlows(b, mesh, edges, c, rel, groups.cold);
	const l2d = couplingCoefficient(b, flows);
	return {
		mesh,
		c,
		mg,
		rel,
		reference: groups.cold,
		flows,
		l2d,
		pcg,
		preconditioner: pre.kind,
		fixedConflict: c.fixedConflict,
		edges
	};
}

/** |L2D(2n) − L2D(n)| / |L2D(2n)| (0 when both are 0: a model whose environments do not exchange heat). */
const relativeChange = (now: number, before: number): number => {
	const scale = Math.abs(now) > 0 ? Math.abs(now) : Math.abs(before);
	return scale > 0 ? Math.abs(now - before) / scale : 0;
};

/**
 * Halve the mesh until L2D changes by no more than the criterion (after at least
 * JUNCTION_MIN_LEVEL halvings), or until the next mesh would exceed the node cap.
 */
export function refine(b: BlockModel, maxCellMm?: number) {
	const div = coarseDivisions(b, maxCellMm);
	const levels: JunctionLevel[] = [];
	const chain: LevelSolution[] = [];
	let met = false;
	for (let level = 0; ; level++) {
		const s = solveLevel(b, div, level, chain);
		if (!s) break;
		const last = chain[chain.length - 1];
		const change = last ? relativeChange(s.l2d, last.l2d) : 0;
		levels.push({
			level,
			nodes: s.mesh.nodeCount,
			maxCellMm: s.mesh.maxCellMm,
			couplingCoefficient: s.l2d,
			change,
			iterations: s.pcg.iterations
		});
		chain.push(s);
		if (level >= JUNCTION_MIN_LEVEL && change <= JUNCTION_REFINEMENT_CRITERION) {
			met = true;
			break;
		}
	}
	return { final: chain[chain.length - 1], levels, met };
}

function notesOf(
	input: JunctionInput,
	b: BlockModel,
	run: ReturnType<typeof refine>,
	balance: number
): string[] {
	const f = run.final;
	const notes = [
		`Mesh: ${run.levels.length} levels, ${run.levels.map((l) => `${l.nodes} nodes → L2D ${fmt(l.couplingCoefficient, 5)}`).join('; ')}.`,
		`Final mesh: ${f.mesh.nodeCount} nodes, largest cell ${fmt(f.mesh.maxCellMm, 2)} mm; solver ${f.pcg.iterations} iterations, relative residual ${f.pcg.relativeResidual.toExponential(1)}; heat balance ${balance.toExponential(1)} of the largest flow.`,
		'Coordinates are taken to the nearest 0.001 mm.'
	];
	if (b.rsTakenAsZero.length)
		notes.push(
			`Rs below 10⁻⁶ m²·K/W taken as zero (fixed surface temperature): ${b.rsTakenAsZero.join(', ')}.`
		);
	const g = temperatureGroups(b);
	const unused = b.envNames.filter((_, i) => !g.used[i]);
	if (unused.length) notes.push(`Environments that no boundary faces (heat flow 0): ${unused.join(', ')}.`);
	if (input.flanks?.length)
		notes.push(
			`Σ U·l over ${input.flanks.length} flank${input.flanks.length > 1 ? 's' : ''}: ${input.flanks.map((fl) => `${fmt(fl.uValue, 4)} × ${fmt(fl.lengthMm / 1000, 4)} m`).join(' + ')}.`
		);
	return notes;
}

/** Heat flows that do not balance to this fraction of the largest draw a caution (this product's choice). */
const BALANCE_CAUTION = 1e-6;

function cautionsOf(b: BlockModel, run: ReturnType<typeof refine>, balance: number): string[] {
	const f = run.final;
	const cautions = [...JUNCTION_CAUTIONS];
	const change = run.levels[run.levels.length - 1].change;
	if (!run.met) cautions.unshift(cautionNotMet(change, f.mesh.nodeCount));
	if (f.fixedConflict) cautions.unshift(CAUTION_FIXED_CONFLICT);
	if (temperatureGroups(b).distinct > 2) cautions.unshift(CAUTION_MANY_TEMPERATURES);
	if (!f.pcg.converged || Math.abs(balance) > BALANCE_CAUTION)
		cautions.unshift(cautionSolver(f.pcg.relativeResidual, balance));
	return cautions;
}

/** Throw if any number in `v` is not finite (a bug, never an input's fault). */
function assertFinite(v: unknown, path = 'result'): void {
	if (typeof v === 'number') {
		if (!Number.isFinite(v)) throw new Error(`junction: ${path} is not finite`);
	} else if (Array.isArray(v)) v.forEach((x, i) => assertFinite(x, `${path}.${i}`));
	else if (v && typeof v === 'object')
		for (const [k, x] of Object.entries(v)) assertFinite(x, `${path}.${k}`);
}

/**
 * Analyse a junction (ISO 10211). Throws {@link JunctionInputError} naming every bad field; every
 * number of the result is finite.
 */
export function analyseJunction(input: JunctionInput): JunctionResult {
	const parsed = parseJunctionInput(input);
	if (!parsed.ok) throw new JunctionInputError(parsed.issues);
	const { data, blocks: b } = parsed;
	const run = refine(b, data.maxCellMm);
	const f = run.final;
	const temperature = f.rel.map((t) => t + f.reference);
	const heat: Record<string, number> = {};
	b.envNames.forEach((n, i) => (heat[n] = f.flows[i]));
	const largest = Math.max(...f.flows.map(Math.abs));
	const balance = largest > 0 ? f.flows.reduce((s, q) => s + q, 0) / largest : 0;
	const flankSum = data.flanks?.reduce((s, fl) => s + (fl.uValue * fl.lengthMm) / 1000, 0);
	const change = run.levels[run.levels.length - 1].change;
	const result: JunctionResult = {
		heatFlows: heat,
		couplingCoefficient: f.l2d,
		...(flankSum === undefined ? {} : { psi: f.l2d - flankSum, flankSum }),
		...surfaceMinimum(b, f.mesh, f.edges, temperature),
		...(data.probes ? { probes: data.probes.map(([x, y]) => valueAt(b, f.mesh, temperature, x, y)) } : {}),
		mesh: { nodes: f.mesh.nodeCount, maxCellMm: f.mesh.maxCellMm, refinementChange: change },
		convergence: { criterion: JUNCTION_REFINEMENT_CRITERION, met: run.met, levels: run.levels },
		solver: {
			preconditioner: f.preconditioner,
			iterations: f.pcg.iterations,
			relativeResidual: f.pcg.relativeResidual,
			converged: f.pcg.converged,
			heatBalance: balance
		},
		method: methodText(change, f.preconditioner),
		cautions: cautionsOf(b, run, balance),
		notes: notesOf(data, b, run, balance)
	};
	assertFinite(result);
	return result;
}

export { parseJunctionInput, JunctionInputError } from './junction-parse';
export { junctionInputSchema } from './junction-schema';
