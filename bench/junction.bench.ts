// Speed of the two-dimensional junction solve. Run: node_modules/.bin/tsx bench/junction.bench.ts
// Prints plain lines and exits 0; targets are reported, never asserted (speed is not a test).
//
//   model      a wall–floor junction (invented demo input): masonry wall with external
//              insulation on a concrete footing, insulated floor slab with screed, a 2 mm steel
//              angle through the floor insulation; Rsi 0.13, Rse 0.04
//   per mesh   meshes of about 5 000, 20 000 and 80 000 nodes (refinement levels of the model);
//              setup (mesh, assembly, the multigrid hierarchy over the coarser levels), the solve
//              (multigrid-preconditioned CG from a zero start to ‖r‖ ≤ 10⁻¹⁰·‖b‖), its iterations,
//              the memory of matrices and vectors, and one sparse matrix–vector product on the
//              same matrix (the floor of any iterative solver) with the ratio solve / product
//   whole run  analyseJunction on the model: every level up to the 1 % criterion, warm-started
import { cpus, loadavg } from 'node:os';
import {
	analyseJunction,
	parseJunctionInput,
	solveLevel,
	type JunctionInput,
	type LevelSolution
} from '../src/lib/physics/junction';
import { buildMesh, coarseDivisions } from '../src/lib/physics/junction-mesh';
import { multiply, solvePcg } from '../src/lib/physics/junction-sparse';
import { multigrid } from '../src/lib/physics/junction-multigrid';
import { assemble } from '../src/lib/physics/junction-assemble';
import { temperatureGroups } from '../src/lib/physics/junction-post';
import { JUNCTION_SOLVER_TOLERANCE } from '../src/lib/physics/junction-bounds';

const TARGET_20K_MS = 150;
const TARGET_100K_MS = 1500;

type Pt = [number, number];
const P = (x: number, y: number): Pt => [x, y];
const input: JunctionInput = {
	regions: [
		{ name: 'concrete footing', x0: -300, y0: -1000, x1: 0, y1: 0, lambda: 2.0 },
		{ name: 'masonry wall', x0: -300, y0: 0, x1: 0, y1: 1500, lambda: 0.77 },
		{ name: 'external insulation', x0: -420, y0: -300, x1: -300, y1: 1500, lambda: 0.035 },
		{ name: 'floor insulation', x0: 0, y0: -100, x1: 1200, y1: 0, lambda: 0.035 },
		{ name: 'slab', x0: 0, y0: -300, x1: 1200, y1: -100, lambda: 2.0 },
		{ name: 'screed', x0: 0, y0: 0, x1: 1200, y1: 70, lambda: 1.4 },
		{ name: 'steel angle', x0: 0, y0: -100, x1: 2, y1: 0, lambda: 50 }
	],
	boundaries: [
		{ from: P(0, 70), to: P(1200, 70), environment: 'inside' },
		{ from: P(0, 70), to: P(0, 1500), environment: 'inside' },
		{ from: P(-420, -300), to: P(-420, 1500), environment: 'outside' },
		{ from: P(-420, -300), to: P(-300, -300), environment: 'outside' },
		{ from: P(-300, -1000), to: P(-300, -300), environment: 'outside' }
	],
	environments: { inside: { temperature: 20, rs: 0.13 }, outside: { temperature: -5, rs: 0.04 } }
};

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Median CPU and wall time (ms) of `fn` over `runs` runs after one warm-up. */
function timeIt(fn: () => void, runs: number): { cpu: number; wall: number } {
	fn();
	const cpu: number[] = [];
	const wall: number[] = [];
	for (let i = 0; i < runs; i++) {
		const c0 = process.cpuUsage();
		const t0 = performance.now();
		fn();
		wall.push(performance.now() - t0);
		const c = process.cpuUsage(c0);
		cpu.push((c.user + c.system) / 1000);
	}
	return { cpu: median(cpu), wall: median(wall) };
}

const parsed = parseJunctionInput(input);
if (!parsed.ok) throw new Error(`benchmark input is invalid: ${JSON.stringify(parsed.issues)}`);
const blocks = parsed.blocks;
const groups = temperatureGroups(blocks);
const extent = Math.max(blocks.kx[blocks.bx] - blocks.kx[0], blocks.ky[blocks.by] - blocks.ky[0]);

/**
 * The chain of solved levels whose last mesh has about `nodes` nodes: the coarse cell size (the
 * maxCellMm of the input) is chosen among steps of 2^(1/4) so that a level lands near the target.
 */
function chainTo(nodes: number): LevelSolution[] {
	let best = { div: coarseDivisions(blocks), level: 0, miss: Infinity };
	for (let step = 0; step < 8; step++) {
		const div = coarseDivisions(blocks, (extent / 16) * 2 ** (-step / 4));
		for (let level = 0; level < 6; level++) {
			const m = buildMesh(blocks, div, level);
			if (!m) break;
			const miss = Math.abs(Math.log(m.nodeCount / nodes));
			if (miss < best.miss) best = { div, level, miss };
		}
	}
	const chain: LevelSolution[] = [];
	for (let level = 0; level <= best.level; level++) chain.push(solveLevel(blocks, best.div, level, chain)!);
	return chain;
}

const f = (x: number, d = 1) => x.toFixed(d);
const mb = (bytes: number) => `${f(bytes / 2 ** 20, 1)} MB`;
const load = loadavg()[0];
console.log(
	`Envelo junction benchmark — one core, Node ${process.version}, ${cpus().length} cores, load average ${f(load, 1)}`
);
console.log(
	`model: wall–floor junction, ${input.regions.length} regions, ${input.boundaries.length} boundaries (demo input)`
);
console.log('medians; CPU = time on the core (process.cpuUsage), wall = elapsed; solve from a zero start');
console.log('');

const results: { nodes: number; solve: number }[] = [];
for (const target of [5000, 20000, 80000]) {
	const chain = chainTo(target);
	const top = chain[chain.length - 1];
	let setupMs = 0;
	const setup = () => {
		const t0 = performance.now();
		const sys = assemble(blocks, top.mesh, top.edges, top.c, groups.cold);
		const pre = multigrid(chain.map((l) => l.mg));
		setupMs = performance.now() - t0;
		return { sys, pre };
	};
	const { sys, pre } = setup();
	let iterations = 0;
	let residual = 0;
	const x = new Float64Array(sys.a.n);
	const tSolve = timeIt(() => {
		x.fill(0);
		const r = solvePcg(sys.a, sys.b, x, pre, { tolerance: JUNCTION_SOLVER_TOLERANCE, maxIterations: 20000 });
		iterations = r.iterations;
		residual = r.relativeResidual;
	}, 5);
	const y = new Float64Array(sys.a.n);
	const spmvRuns = 50;
	const tSpmv = timeIt(() => {
		for (let k = 0; k < spmvRuns; k++) multiply(sys.a, x, y);
	}, 5);
	const spmv = tSpmv.cpu / spmvRuns;
	const csrBytes = sys.a.val.byteLength + sys.a.col.byteLength + sys.a.rowPtr.byteLength;
	const levelBytes = chain.reduce((sum, l) => {
		const p = l.mg.p;
		const pBytes = p ? p.ptr.byteLength + p.idx.byteLength + p.w.byteLength : 0;
		return (
			sum +
			l.mg.a.val.byteLength +
			l.mg.a.col.byteLength +
			l.mg.a.rowPtr.byteLength +
			l.mg.slot.byteLength +
			pBytes
		);
	}, 0);
	const mem = process.memoryUsage();
	results.push({ nodes: top.mesh.nodeCount, solve: tSolve.cpu });
	console.log(
		`${String(top.mesh.nodeCount).padStart(6)} nodes (level ${top.mesh.level}, ${sys.a.n} free, ${sys.a.col.length} nonzeros)  ` +
			`solve CPU ${f(tSolve.cpu)} ms  wall ${f(tSolve.wall)} ms  ${iterations} iterations (residual ${residual.toExponential(1)})  ` +
			`setup ${f(setupMs)} ms  SpMV ${f(spmv, 3)} ms  solve/SpMV ${f(tSolve.cpu / spmv, 0)}×  ` +
			`matrix ${mb(csrBytes)}, all levels' matrices and transfers ${mb(levelBytes)}, process heap + typed arrays ${mb(mem.heapUsed + mem.arrayBuffers)}`
	);
}

const tWhole = timeIt(() => void analyseJunction(input), 3);
const whole = analyseJunction(input);
console.log('');
console.log(
	`whole analyseJunction: CPU ${f(tWhole.cpu)} ms  wall ${f(tWhole.wall)} ms  ${whole.convergence.levels.length} levels to ${whole.mesh.nodes} nodes  ` +
		`(iterations ${whole.convergence.levels.map((l) => l.iterations).join(', ')}; last halving changed L2D by ${f(whole.mesh.refinementChange * 100, 3)} %)  ` +
		`L2D ${f(whole.couplingCoefficient, 4)} W/(m·K)  fRsi ${f(whole.fRsi, 3)}`
);
console.log('');
const near = (n: number) => results.reduce((a, b) => (Math.abs(b.nodes - n) < Math.abs(a.nodes - n) ? b : a));
const r20 = near(20000);
const r80 = near(80000);
console.log(
	`target: 20 000 nodes under ${TARGET_20K_MS} ms — ${r20.nodes} nodes in ${f(r20.solve)} ms: ${r20.solve < TARGET_20K_MS ? 'met' : 'NOT met'} (CPU)`
);
const per100k = (r80.solve * 100000) / r80.nodes;
console.log(
	`target: 100 000 nodes under ${TARGET_100K_MS} ms — ${r80.nodes} nodes in ${f(r80.solve)} ms, ≈ ${f(per100k)} ms scaled linearly to 100 000: ${per100k < TARGET_100K_MS ? 'met' : 'NOT met'} (CPU)`
);
if (load > cpus().length)
	console.log(
		`note: the machine is shared and loaded (load ${f(load, 1)} on ${cpus().length} cores); wall times include waiting for a core.`
	);
