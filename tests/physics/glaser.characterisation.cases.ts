// Inputs of the characterisation test of the Glaser cycle (glaser.characterisation.test.ts), and
// the code that runs them and encodes the outcome. Shared by the test and by the script that wrote
// the fixture once (glaser.characterisation.generate.ts), so both run exactly the same calls.
// Build-ups, climates and chains are constructed inputs, not real sites or products.
//
// Two kinds of case:
//   element  analyseElement on a build-up with a climate and internal conditions; the condensation
//            result with the notes and warnings of the analysis is kept (the Glaser check through
//            the element: sublayers, bridged sections, zero-sd layers, humidity classes)
//   chain    runGlaser on a vapour chain written out by hand (zero-sd groups, unusual months)
import {
	analyseElement,
	runGlaser,
	type ElementInput,
	type GlaserChain,
	type GlaserMonth
} from '../../src/lib/physics';
import { encode } from './element.characterisation.cases';

type Climate = NonNullable<ElementInput['climate']>;
type Layers = ElementInput['layers'];
type HumidityClass = 1 | 2 | 3 | 4 | 5;

/* ------------------------------------------------------------------ climates (constructed) */

const fromSeries = (t: number[], rh: number[]): Climate =>
	t.map((temperature, i) => ({ month: i + 1, temperature, relativeHumidity: rh[i] }));

/** Cool-temperate: a cold winter and a warm summer. */
const COOL = fromSeries(
	[-2, -1, 3, 7, 11, 15, 17, 17, 13, 9, 4, 0],
	[90, 88, 82, 76, 74, 74, 75, 78, 83, 87, 90, 91]
);
/** A hard winter, humid all year. */
const COLD = fromSeries(
	[-10, -10, -5, 3, 10, 15, 18, 17, 12, 6, 0, -5],
	[90, 90, 90, 90, 90, 90, 90, 90, 90, 90, 90, 90]
);
/** A winter broken by one warm, dry month (March): condensate of January and February dries in it. */
const WARM_SPELL = fromSeries(
	[-6, -4, 16, 2, 8, 14, 18, 18, 13, 7, 1, -3],
	[88, 86, 55, 84, 78, 72, 70, 72, 80, 86, 90, 90]
);
/** Only December is cold enough for condensation; the cycle starts there and wraps into the year. */
const ONE_COLD_MONTH = fromSeries(
	[10, 11, 13, 15, 17, 19, 21, 21, 18, 15, 13, -8],
	[80, 78, 76, 74, 72, 70, 70, 72, 75, 78, 80, 92]
);
/** January cold, December mild: a cycle that starts in the first calendar month. */
const JANUARY_START = fromSeries(
	[-9, -3, 2, 7, 12, 16, 19, 18, 14, 12, 12, 12],
	[92, 88, 84, 78, 74, 72, 72, 74, 78, 80, 80, 80]
);
/** Cool-temperate with February the coldest month. */
const FEBRUARY_COLDEST = fromSeries(
	[0, -4, 3, 7, 11, 15, 17, 17, 13, 9, 4, 1],
	[90, 88, 82, 76, 74, 74, 75, 78, 83, 87, 90, 91]
);
/** Mild all year: a month with light condensation beside months without. */
const MILD = fromSeries(
	[4, 5, 7, 9, 12, 15, 17, 17, 15, 12, 8, 5],
	[86, 84, 80, 76, 74, 72, 72, 74, 78, 82, 85, 87]
);
const constant = (temperature: number, relativeHumidity: number): Climate =>
	Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature, relativeHumidity }));

/* ------------------------------------------------------------------ build-ups (constructed) */

/** Timber-frame wall with a vapour-tight outer sheathing (sd 10 m) and a vapour control layer of `vclSd` m (0: none). */
const timberFrameTightOutside = (vclSd: number): Layers => [
	{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	...(vclSd > 0 ? [{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: vclSd }] : []),
	{
		name: 'mineral wool between studs',
		thicknessMm: 140,
		lambda: 0.035,
		mu: 1,
		bridge: { lambda: 0.13, widthMm: 38, centresMm: 600, mu: 50 }
	},
	{ name: 'bitumen-coated sheathing board', thicknessMm: 12, lambda: 0.13, sd: 10 },
	{ name: 'battens, still air', thicknessMm: 25, air: 'unventilated' },
	{ name: 'timber cladding', thicknessMm: 20, lambda: 0.13, mu: 50 }
];

/** Warm flat roof: deck, vapour control layer of `vclSd` m, insulation, waterproofing (sd 200 m). */
const warmFlatRoof = (vclSd: number): Layers => [
	{ name: 'plasterboard ceiling', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	{ name: 'timber deck', thicknessMm: 18, lambda: 0.13, mu: 150 },
	{ name: 'vapour control layer', thicknessMm: 0.3, resistance: 0, sd: vclSd },
	{ name: 'PIR board', thicknessMm: 120, lambda: 0.022, mu: 60 },
	{ name: 'waterproofing', thicknessMm: 4, resistance: 0, sd: 200 }
];

/** Solid masonry insulated on the inside, without a vapour control layer. */
const masonryInsideInsulation = (): Layers => [
	{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	{ name: 'mineral wool', thicknessMm: 60, lambda: 0.035, mu: 1 },
	{ name: 'solid brick', thicknessMm: 225, lambda: 0.77, mu: 10 },
	{ name: 'cement render', thicknessMm: 20, lambda: 1.0, mu: 25 }
];

/** Cavity masonry wall with a partial fill and a vapour-tight external coating. */
const masonryCavity = (): Layers => [
	{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
	{ name: 'block', thicknessMm: 100, lambda: 0.19, mu: 8 },
	{ name: 'cavity insulation', thicknessMm: 100, lambda: 0.035, mu: 1 },
	{ name: 'residual cavity', thicknessMm: 50, air: 'unventilated' },
	{ name: 'brick', thicknessMm: 102.5, lambda: 0.77, mu: 10 },
	{ name: 'elastomeric coating', thicknessMm: 1, resistance: 0, sd: 4 }
];

/** Two boards between insulation layers: condensation on both at once. */
const threeBoards = (): Layers => [
	{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	{ name: 'mineral wool A', thicknessMm: 80, lambda: 0.04, mu: 1 },
	{ name: 'board 1', thicknessMm: 12, lambda: 0.13, sd: 0.8 },
	{ name: 'mineral wool B', thicknessMm: 80, lambda: 0.04, mu: 1 },
	{ name: 'board 2', thicknessMm: 12, lambda: 0.13, sd: 2 },
	{ name: 'mineral wool C', thicknessMm: 60, lambda: 0.04, mu: 1 },
	{ name: 'outer board', thicknessMm: 12, lambda: 0.13, sd: 6 }
];

/* ------------------------------------------------------------------ chains written out by hand */

const DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];
const psat = (t: number): number =>
	t >= 0 ? 610.5 * Math.exp((17.269 * t) / (237.3 + t)) : 610.5 * Math.exp((21.875 * t) / (265.5 + t));

/** Twelve months at internal θi/φi, external temperatures `te` and humidity φe. */
const chainMonths = (ti: number, phiI: number, te: number[], phiE: number[]): GlaserMonth[] =>
	te.map((t, i) => ({
		month: i + 1,
		days: DAYS[i],
		externalTemperature: t,
		externalVapourPressure: phiE[i] * psat(t),
		internalTemperature: ti,
		internalVapourPressure: phiI * psat(ti)
	}));

/**
 * A chain from sd and φ per element/node: positions 10 mm apart, each node the end of layer
 * `layerOf[j]`, kinds from the layer changes.
 */
function chain(sd: number[], phi: number[], layerOf: number[]): GlaserChain {
	const n = sd.length;
	return {
		elements: n,
		positionMm: Array.from({ length: n + 1 }, (_, j) => 10 * j),
		sd,
		phi,
		layerIndex: layerOf,
		kind: layerOf.map((l, j) =>
			j === 0
				? 'internal-surface'
				: j === n
					? 'external-surface'
					: layerOf[j + 1] === l
						? 'sublayer'
						: 'interface'
		)
	};
}

/* ------------------------------------------------------------------ the cases */

export type Case =
	| { name: string; kind: 'element'; input: ElementInput }
	| { name: string; kind: 'chain'; chain: GlaserChain; months: GlaserMonth[] };

const element = (name: string, input: ElementInput): Case => ({ name, kind: 'element', input });
const classes: HumidityClass[] = [1, 2, 3, 4, 5];

export const CASES: Case[] = [
	// --- timber-frame wall, vapour-tight outside: humidity classes 1–5, with and without a VCL
	...classes.map((humidityClass) =>
		element(`timber frame, tight outside, no VCL, class ${humidityClass}, cool climate`, {
			heatFlow: 'horizontal',
			layers: timberFrameTightOutside(0),
			internal: { temperature: 20, humidityClass },
			climate: COOL
		})
	),
	element('timber frame, tight outside, VCL sd 2 m, class 3, warm spell in March', {
		heatFlow: 'horizontal',
		layers: timberFrameTightOutside(2),
		internal: { temperature: 20, humidityClass: 3 },
		climate: WARM_SPELL
	}),
	element('timber frame, tight outside, VCL sd 50 m, class 4, cold climate', {
		heatFlow: 'horizontal',
		layers: timberFrameTightOutside(50),
		internal: { temperature: 20, humidityClass: 4 },
		climate: COLD
	}),

	// --- warm flat roof
	...classes.map((humidityClass) =>
		element(`warm flat roof, VCL sd 5 m, class ${humidityClass}, cold climate`, {
			heatFlow: 'upward',
			layers: warmFlatRoof(5),
			internal: { temperature: 20, humidityClass },
			climate: COLD
		})
	),
	element('warm flat roof, VCL sd 100 m, class 5, cold climate', {
		heatFlow: 'upward',
		layers: warmFlatRoof(100),
		internal: { temperature: 20, humidityClass: 5 },
		climate: COLD
	}),
	element('warm flat roof, VCL sd 1 m, 60 % inside, warm spell in March', {
		heatFlow: 'upward',
		layers: warmFlatRoof(1),
		internal: { temperature: 21, relativeHumidity: 60 },
		climate: WARM_SPELL
	}),

	// --- masonry
	...classes.map((humidityClass) =>
		element(`masonry insulated inside, class ${humidityClass}, warm spell in March`, {
			heatFlow: 'horizontal',
			layers: masonryInsideInsulation(),
			internal: { temperature: 20, humidityClass },
			climate: WARM_SPELL
		})
	),
	element('masonry cavity wall with tight coating, class 4, cool climate', {
		heatFlow: 'horizontal',
		layers: masonryCavity(),
		internal: { temperature: 20, humidityClass: 4 },
		climate: COOL
	}),
	element('masonry cavity wall with tight coating, class 2, mild climate', {
		heatFlow: 'horizontal',
		layers: masonryCavity(),
		internal: { temperature: 20, humidityClass: 2 },
		climate: MILD
	}),

	// --- several interfaces at once; drying part-way through a month
	...([3, 4, 5] as const).map((humidityClass) =>
		element(`three boards, two or more planes at once, class ${humidityClass}, cool climate`, {
			heatFlow: 'horizontal',
			layers: threeBoards(),
			internal: { temperature: 20, humidityClass },
			climate: COOL
		})
	),
	element('three boards, class 4, warm spell in March', {
		heatFlow: 'horizontal',
		layers: threeBoards(),
		internal: { temperature: 20, humidityClass: 4 },
		climate: WARM_SPELL
	}),

	// --- start month rules
	element('start in December, the only month with condensation', {
		heatFlow: 'horizontal',
		layers: masonryInsideInsulation(),
		internal: { temperature: 20, humidityClass: 2 },
		climate: ONE_COLD_MONTH
	}),
	element('start in January (December without condensation)', {
		heatFlow: 'horizontal',
		layers: timberFrameTightOutside(0),
		internal: { temperature: 20, humidityClass: 2 },
		climate: JANUARY_START
	}),
	element('condensation in every month: starts in month 1', {
		heatFlow: 'upward',
		layers: warmFlatRoof(1),
		internal: { temperature: 20, relativeHumidity: 70 },
		climate: constant(-2, 85)
	}),
	element('no condensation in any month: no start month, coldest month (February) charted', {
		heatFlow: 'horizontal',
		layers: timberFrameTightOutside(200),
		internal: { temperature: 20, humidityClass: 1 },
		climate: FEBRUARY_COLDEST
	}),
	element('climate given out of calendar order', {
		heatFlow: 'horizontal',
		layers: threeBoards(),
		internal: { temperature: 20, humidityClass: 3 },
		climate: [...WARM_SPELL].reverse()
	}),

	// --- chains written out by hand
	{
		name: 'chain: zero-sd elements join nodes, the coldest member sets psat',
		kind: 'chain',
		// elements: sd 0.05 | 0 | 0.1 | 0.1 | 0 | 0 | 4 | 0.02; layers: 0, 1, 1, 2, 2, 3, 4, 5
		chain: chain(
			[0.05, 0, 0.1, 0.1, 0, 0, 4, 0.02],
			[1, 0.96, 0.8, 0.55, 0.3, 0.28, 0.2, 0.05, 0],
			[-1, 0, 1, 1, 2, 2, 3, 4, 5]
		),
		months: chainMonths(
			20,
			0.55,
			[-5, -3, 2, 6, 10, 14, 17, 16, 12, 7, 2, -2],
			[0.9, 0.88, 0.82, 0.78, 0.75, 0.72, 0.7, 0.72, 0.78, 0.84, 0.88, 0.9]
		)
	},
	{
		name: 'chain: humid inside, surface condensation months, two wet nodes',
		kind: 'chain',
		chain: chain(
			[0.02, 0.5, 0.02, 0.02, 3, 0.01],
			[0.85, 0.8, 0.65, 0.5, 0.3, 0.1, 0],
			[-1, 0, 1, 2, 2, 3, 4]
		),
		months: chainMonths(
			16,
			0.95,
			[-8, -6, 0, 5, 9, 13, 15, 15, 11, 6, 1, -4],
			[0.9, 0.9, 0.85, 0.8, 0.78, 0.76, 0.75, 0.76, 0.8, 0.85, 0.88, 0.9]
		)
	},
	{
		name: 'chain: zero-sd elements at both surfaces join them to the first and last nodes',
		kind: 'chain',
		chain: chain([0, 0.3, 0.02, 5, 0], [0.9, 0.88, 0.5, 0.3, 0.1, 0.05], [-1, 0, 1, 2, 3, 4]),
		months: chainMonths(
			20,
			0.6,
			[-4, -2, 3, 8, 12, 16, 18, 18, 14, 9, 4, -1],
			[0.9, 0.88, 0.82, 0.76, 0.74, 0.72, 0.72, 0.74, 0.8, 0.86, 0.9, 0.9]
		)
	},
	{
		name: 'chain: every month alike and dry, profile of the first coldest month',
		kind: 'chain',
		chain: chain([1, 1, 1], [1, 0.7, 0.4, 0], [-1, 0, 1, 2]),
		months: chainMonths(20, 0.4, new Array(12).fill(5), new Array(12).fill(0.8))
	},
	{
		name: 'chain: zero total sd is refused',
		kind: 'chain',
		chain: chain([0, 0], [1, 0.5, 0], [-1, 0, 1]),
		months: chainMonths(20, 0.5, new Array(12).fill(0), new Array(12).fill(0.8))
	}
];

/* ------------------------------------------------------------------ running and encoding */

/** One case's outcome, encoded (see element.characterisation.cases.ts for the encoding). */
export function runCase(c: Case): unknown {
	try {
		if (c.kind === 'chain') return encode({ value: runGlaser(structuredClone(c.chain), c.months) });
		const r = analyseElement(structuredClone(c.input));
		return encode({ value: { condensation: r.condensation, notes: r.notes, warnings: r.warnings } });
	} catch (e) {
		return encode({ threw: e });
	}
}

/** Path of the fixture, relative to the repository root. */
export const FIXTURE_PATH = 'tests/physics/fixtures/glaser-characterisation.json';
