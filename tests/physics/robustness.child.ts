// Run in a child process by robustness.test.ts, with a small heap and a timeout, so that an input
// that exhausts the memory or hangs fails that test instead of killing the test run:
//   node --max-old-space-size=64 --import tsx tests/physics/robustness.child.ts <case>
// Prints one line of JSON: the outcome of analysing the case from raw input.
import { analyseElement, ElementInputError, type ElementInput } from '../../src/lib/physics';

const climate = Array.from({ length: 12 }, (_, i) => ({
	month: i + 1,
	temperature: [-2, -1, 3, 7, 11, 15, 17, 17, 13, 9, 4, 0][i],
	relativeHumidity: 85
}));

/** A masonry wall whose second layer has conductivity `lambda` (constructed input, not a product). */
const wall = (lambda: number): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
		{ name: 'layer under test', thicknessMm: 100, lambda, mu: 5 },
		{ name: 'insulation', thicknessMm: 100, lambda: 0.035, mu: 1 },
		{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.1 }
	],
	internal: { temperature: 20, relativeHumidity: 60 },
	climate
});

/**
 * The largest accepted build-up by resistance: two layers of the largest resistance per layer
 * (100 m²·K/W), so the layers' total is at its bound (200 m²·K/W).
 */
const largestAccepted = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'R 100 given', thicknessMm: 100, resistance: 100, mu: 5 },
		{ name: 'R 100 from λ', thicknessMm: 100, lambda: 0.001, sd: 0.1 }
	],
	internal: { temperature: 20, relativeHumidity: 60 },
	climate
});

/**
 * The costliest accepted input found (as in bench/physics.bench.ts): 100 layers (the most) of R = 2
 * (the layers' total at its bound, 800 sublayers), 8 bridged (the most), sd rising outwards so that
 * condensation spreads over every interface, a climate swinging between −10 °C and 15 °C.
 */
const mostWork = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: Array.from({ length: 100 }, (_, i) => ({
		name: `layer ${i + 1}`,
		thicknessMm: 100,
		resistance: 2,
		sd: 0.01 * (i + 1),
		...(i % 12 === 0 && i < 96 ? { bridge: { lambda: 0.13, fraction: 0.1, mu: 1 } } : {})
	})),
	internal: { temperature: 25, relativeHumidity: 80 },
	climate: [-10, 15, -10, 15, -10, 15, -10, 15, -10, 15, -10, 15].map((t, i) => ({
		month: i + 1,
		temperature: t,
		relativeHumidity: 95
	}))
});

const CASES: Record<string, () => unknown> = {
	'lambda-1e-9': () => wall(1e-9),
	'lambda-1e-6': () => wall(1e-6),
	'largest-accepted': largestAccepted,
	'most-work': mostWork
};

const which = process.argv[2];
const make = CASES[which];
if (!make) {
	console.log(JSON.stringify({ error: `unknown case ${which}` }));
	process.exit(2);
}
try {
	const r = analyseElement(make() as ElementInput);
	console.log(
		JSON.stringify({
			result: {
				uValue: r.uValue,
				profilePoints: r.profile.length,
				glaserNodes: r.condensation?.nodes.length ?? null,
				notes: r.notes
			},
			heapUsedMb: process.memoryUsage().heapUsed / 1e6
		})
	);
} catch (e) {
	console.log(
		JSON.stringify(
			e instanceof ElementInputError ? { refused: e.issues } : { threw: String(e), name: (e as Error).name }
		)
	);
}
