// Speed of the calculation core. Run: node_modules/.bin/tsx bench/physics.bench.ts
// Prints plain lines and exits 0; targets are reported, never asserted (speed is not a test).
//
//   full analysis  analyseElement on a 10-layer build-up with two bridged layers and 12 climate
//                  months (validation, U, profile, fRsi, Glaser cycle, result objects), on the raw
//                  object; and on the output of parseElementInput, as the API, the element save
//                  and the reports call it (validated once at the boundary, not again inside)
//   worst case     analyseElement on the costliest accepted input found: 100 layers (the most the
//                  input allows) of R = 2 m²·K/W (the layers' total at its bound, 200 m²·K/W, so
//                  800 sublayers), 8 bridged (the most), sd rising inwards-out so that condensation
//                  spreads over every interface, a climate that swings between −10 °C and 15 °C
//                  month by month, 80 % inside at 25 °C; beside the typical one
//   FE kernel      solveSeries on the element's heat chain (Rsi, 10 layers, Rse)
//   floor (a)      closed-form series sum for the same resistances
//   floor (b)      dense-matrix solve (ml-matrix LU) of the same assembled system
import { cpus, loadavg } from 'node:os';
import { Matrix, solve } from 'ml-matrix';
import {
	analyseElement,
	parseElementInput,
	buildThermalModel,
	createSeriesWork,
	solveSeries,
	type ElementInput
} from '../src/lib/physics';

const TARGET_FULL_US = 50;
const TARGET_KERNEL_RATIO = 3;

// Climate: constructed monthly means for a cool-temperate site (demo data, not a real site).
const T = [-2, -1, 3, 7, 11, 15, 17, 17, 13, 9, 4, 0];
const RH = [90, 88, 82, 76, 74, 74, 75, 78, 83, 87, 90, 91];

const input: ElementInput = {
	heatFlow: 'horizontal',
	layers: [
		{ name: 'gypsum plaster', thicknessMm: 10, lambda: 0.4, mu: 10 },
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
		{
			name: 'service void between battens',
			thicknessMm: 25,
			air: 'unventilated',
			bridge: { lambda: 0.13, widthMm: 38, centresMm: 600, mu: 50 }
		},
		{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 20 },
		{ name: 'OSB', thicknessMm: 15, lambda: 0.13, mu: 150 },
		{
			name: 'mineral wool between studs',
			thicknessMm: 140,
			lambda: 0.035,
			mu: 1,
			bridge: { lambda: 0.13, fraction: 0.15, mu: 50 },
			airGapLevel: 1
		},
		{ name: 'wood fibre board', thicknessMm: 60, lambda: 0.045, mu: 5 },
		{ name: 'breather membrane', thicknessMm: 0.5, resistance: 0, sd: 0.05 },
		{ name: 'counter battens, still air', thicknessMm: 25, air: 'unventilated' },
		{ name: 'timber cladding', thicknessMm: 20, lambda: 0.13, mu: 50 }
	],
	internal: { temperature: 20, humidityClass: 3 },
	climate: T.map((t, i) => ({ month: i + 1, temperature: t, relativeHumidity: RH[i] }))
};

// The costliest accepted input found (by trying the bounds' corners; a search, not a proof).
const SWING = [-10, 15, -10, 15, -10, 15, -10, 15, -10, 15, -10, 15];
const worst: ElementInput = {
	heatFlow: 'horizontal',
	layers: Array.from({ length: 100 }, (_, i) => ({
		name: `layer ${i + 1}`,
		thicknessMm: 100,
		resistance: 2,
		sd: 0.01 * (i + 1),
		...(i % 12 === 0 && i < 96 ? { bridge: { lambda: 0.13, fraction: 0.1, mu: 1 } } : {})
	})),
	internal: { temperature: 25, relativeHumidity: 80 },
	climate: SWING.map((t, i) => ({ month: i + 1, temperature: t, relativeHumidity: 95 }))
};

function median(xs: number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Median time per call in µs over `batches` batches of `perBatch` calls, after a warm-up: wall
 * clock, and CPU time of this process (process.cpuUsage), which leaves out the time the process
 * waits for a core while other work shares the machine.
 */
function timeIt(fn: () => number, perBatch: number, batches: number): { wall: number; cpu: number } {
	let sink = 0;
	for (let i = 0; i < perBatch * 3; i++) sink += fn();
	const wall: number[] = [];
	const cpu: number[] = [];
	for (let b = 0; b < batches; b++) {
		const c0 = process.cpuUsage();
		const t0 = performance.now();
		for (let i = 0; i < perBatch; i++) sink += fn();
		const t1 = performance.now();
		const c = process.cpuUsage(c0);
		wall.push(((t1 - t0) * 1000) / perBatch);
		cpu.push((c.user + c.system) / perBatch);
	}
	if (sink === 0.123456789) console.log('');
	return { wall: median(wall), cpu: median(cpu) };
}

// The heat chain of the element: Rsi, the path resistance of each layer, Rse. Arrays are built the
// way the engine builds its own (plain arrays of doubles), so the kernel runs as it does inside.
const model = buildThermalModel(input);
const rChain = [model.rsi, ...model.layers.slice(0, model.active).map((l) => l.rPath), model.rse];
const n = rChain.length;
const plain = (len: number, at: (i: number) => number): number[] => {
	const a: number[] = new Array(len);
	for (let i = 0; i < len; i++) a[i] = at(i);
	return a;
};
const rArr = plain(n, (i) => rChain[i]);
const gChain = plain(n, (i) => (rChain[i] > 0 ? 1 / rChain[i] : Infinity));
const rFinite = rChain.filter((r) => r > 0); // the dense solve cannot take g = ∞; merge as the kernel does
const gFinite = rFinite.map((r) => 1 / r);
const out = plain(n + 1, () => 0.5);
const work = createSeriesWork(n);

const closedForm = (): number => {
	let total = 0;
	for (let i = 0; i < n; i++) total += rArr[i];
	const q = 20 / total;
	let acc = 0;
	out[0] = 20;
	for (let i = 0; i < n; i++) {
		acc += rArr[i];
		out[i + 1] = 20 - q * acc;
	}
	return q;
};
const kernel = (): number => solveSeries(gChain, 0, n, 20, 0, out, work);
const dense = (): number => {
	const m = gFinite.length + 1;
	const k = Matrix.zeros(m, m);
	const b = Matrix.zeros(m, 1);
	for (let e = 0; e < gFinite.length; e++) {
		const g = gFinite[e];
		k.set(e, e, k.get(e, e) + g);
		k.set(e + 1, e + 1, k.get(e + 1, e + 1) + g);
		k.set(e, e + 1, -g);
		k.set(e + 1, e, -g);
	}
	for (let c = 0; c < m; c++) {
		k.set(0, c, c === 0 ? 1 : 0);
		k.set(m - 1, c, c === m - 1 ? 1 : 0);
	}
	b.set(0, 0, 20);
	const x = solve(k, b);
	return x.get(1, 0);
};
const full = (): number => analyseElement(input).uValue;
const parsed = parseElementInput(input);
if (!parsed.ok) throw new Error('benchmark input is invalid');
const parsedInput = parsed.data;
const fullParsed = (): number => analyseElement(parsedInput).uValue;
if (!parseElementInput(worst).ok) throw new Error('worst-case input is refused');
const fullWorst = (): number => analyseElement(worst).uValue;

// Sanity: the three solves agree before they are timed.
kernel();
const kVals = Array.from(out);
closedForm();
const cVals = Array.from(out);
const maxDiff = Math.max(...kVals.map((v, i) => Math.abs(v - cVals[i])));

const t0 = performance.now();
const tFull = timeIt(full, 200, 40);
const tFullParsed = timeIt(fullParsed, 200, 40);
const tWorst = timeIt(fullWorst, 2, 15);
const tKernel = timeIt(kernel, 20000, 40);
const tClosed = timeIt(closedForm, 20000, 40);
const tDense = timeIt(dense, 2000, 30);
const elapsed = (performance.now() - t0) / 1000;

const r = analyseElement(input);
const f = (x: number, d = 2) => x.toFixed(d);
const ns = (x: number) => `${f(x * 1000, 1)} ns`;
const load = loadavg()[0];
console.log(
	`Envelo physics benchmark — one core, Node ${process.version}, ${cpus().length} cores, load average ${f(load, 1)}`
);
console.log(
	`build-up: ${input.layers.length} layers, 2 bridged, 12 climate months; ${r.condensation!.nodes.length} Glaser nodes; U = ${f(r.uValue, 4)} W/(m²·K); outcome ${r.condensation!.outcome}`
);
console.log(`kernel vs closed form, largest node difference: ${maxDiff.toExponential(2)} °C`);
console.log('medians per call; CPU = time on the core (process.cpuUsage), wall = elapsed');
console.log('');
console.log(
	`full analysis (analyseElement)     CPU ${f(tFull.cpu)} µs   wall ${f(tFull.wall)} µs   ${f(1e6 / tFull.cpu, 0)} elements/s on one core (raw input: validated, then calculated)`
);
console.log(
	`full analysis, parsed input        CPU ${f(tFullParsed.cpu)} µs   wall ${f(tFullParsed.wall)} µs   ${f(1e6 / tFullParsed.cpu, 0)} elements/s on one core (output of parseElementInput: calculated only)`
);
const rw = analyseElement(worst);
console.log(
	`worst accepted input               CPU ${f(tWorst.cpu / 1000)} ms   wall ${f(tWorst.wall / 1000)} ms   ${f(tWorst.cpu / tFull.cpu, 0)}× the typical (${worst.layers.length} layers, ${rw.condensation!.nodes.length} Glaser nodes, outcome ${rw.condensation!.outcome})`
);
console.log(`FE kernel (Thomas, ${n} elements)     CPU ${ns(tKernel.cpu)}   wall ${ns(tKernel.wall)}`);
console.log(`floor (a) closed-form series sum     CPU ${ns(tClosed.cpu)}   wall ${ns(tClosed.wall)}`);
console.log(`floor (b) dense solve (ml-matrix)    CPU ${ns(tDense.cpu)}   wall ${ns(tDense.wall)}`);
console.log(
	`ratio FE kernel / closed form        ${f(tKernel.cpu / tClosed.cpu)}× (CPU)   ${f(tKernel.wall / tClosed.wall)}× (wall)`
);
console.log(`ratio FE kernel / dense solve        ${f(tKernel.cpu / tDense.cpu, 4)}× (CPU)`);
console.log('');
console.log(
	`target: full analysis under ${TARGET_FULL_US} µs — raw input ${tFull.cpu < TARGET_FULL_US ? 'met' : 'NOT met'} (CPU), ${tFull.wall < TARGET_FULL_US ? 'met' : 'NOT met'} (wall); parsed input ${tFullParsed.cpu < TARGET_FULL_US ? 'met' : 'NOT met'} (CPU), ${tFullParsed.wall < TARGET_FULL_US ? 'met' : 'NOT met'} (wall)`
);
console.log(
	`target: FE kernel within ${TARGET_KERNEL_RATIO}× of the closed form — ${tKernel.cpu / tClosed.cpu <= TARGET_KERNEL_RATIO ? 'met' : 'NOT met'} (CPU)`
);
if (load > cpus().length)
	console.log(
		`note: the machine is shared and loaded (load ${f(load, 1)} on ${cpus().length} cores); wall times include waiting for a core.`
	);
console.log(`(measured in ${f(elapsed, 1)} s)`);
