// Inputs of the characterisation test of analyseElement / buildThermalModel, and the code that runs
// them and encodes the outcome. Shared by the test (element.characterisation.test.ts) and by the
// script that wrote the fixture once (element.characterisation.generate.ts), so both run exactly
// the same calls. Build-ups and climates are constructed inputs, not real sites or products.
import {
	analyseElement,
	buildThermalModel,
	parseElementInput,
	solveThicknessDetailed,
	type ElementInput
} from '../../src/lib/physics';

type Climate = NonNullable<ElementInput['climate']>;
type Layers = ElementInput['layers'];

/* ------------------------------------------------------------------ climates (constructed) */

const fromSeries = (t: number[], rh: number[]): Climate =>
	t.map((temperature, i) => ({ month: i + 1, temperature, relativeHumidity: rh[i] }));

const COOL = fromSeries(
	[-2, -1, 3, 7, 11, 15, 17, 17, 13, 9, 4, 0],
	[90, 88, 82, 76, 74, 74, 75, 78, 83, 87, 90, 91]
);
const COLD = fromSeries(
	[-10, -10, -5, 3, 10, 15, 18, 17, 12, 6, 0, -5],
	[90, 90, 90, 90, 90, 90, 90, 90, 90, 90, 90, 90]
);
const constant = (temperature: number, relativeHumidity: number): Climate =>
	Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature, relativeHumidity }));
/** Every month warmer outside than inside at 18 °C. */
const HOT = fromSeries(
	[22, 23, 25, 27, 29, 31, 33, 33, 30, 27, 24, 22],
	[60, 60, 65, 65, 70, 70, 70, 70, 65, 65, 60, 60]
);
/** COOL, listed in a scrambled order (the engine sorts by month). */
const COOL_SCRAMBLED = [6, 0, 11, 3, 8, 1, 10, 5, 2, 9, 7, 4].map((i) => ({ ...COOL[i] }));

/* ------------------------------------------------------------------ build-ups (constructed) */

const timberFrame = (): Layers => [
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
];

const masonry = (): Layers => [
	{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
	{ name: 'block', thicknessMm: 100, lambda: 0.19, mu: 8 },
	{ name: 'cavity insulation', thicknessMm: 100, lambda: 0.022, mu: 60 },
	{ name: 'residual cavity', thicknessMm: 50, air: 'unventilated' },
	{ name: 'brick', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
];

const twoPlanes = (): Layers => [
	{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	{ name: 'mineral wool A', thicknessMm: 100, lambda: 0.04, mu: 1 },
	{ name: 'board', thicknessMm: 12, lambda: 0.13, sd: 1 },
	{ name: 'mineral wool B', thicknessMm: 100, lambda: 0.04, mu: 1 },
	{ name: 'outer board', thicknessMm: 12, lambda: 0.13, sd: 3 }
];

const slab = { name: 'concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 };
const floorBoard = { name: 'floor insulation', thicknessMm: 100, lambda: 0.035, mu: 50 };
const screed = { name: 'screed', thicknessMm: 65, lambda: 1.15, mu: 15 };

const ceiling = (): Layers => [
	{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
	{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
	{
		name: 'mineral wool between joists',
		thicknessMm: 150,
		lambda: 0.04,
		mu: 1,
		bridge: { lambda: 0.13, widthMm: 47, centresMm: 400, mu: 50 }
	},
	{ name: 'mineral wool over joists', thicknessMm: 150, lambda: 0.04, mu: 1 }
];

/* ------------------------------------------------------------------ the cases */

export interface Case {
	name: string;
	/** passed as given to parseElementInput and analyseElement */
	input: unknown;
	/** buildThermalModel with a thickness override of one layer (the inverse solve's call) */
	override?: { index: number; thicknessMm: number };
	/** solveThicknessDetailed(input, layerIndex, targetU, products) */
	inverse?: { layerIndex: number; targetU: number; products?: number[] };
}

const el = (e: ElementInput): ElementInput => e;

export const CASES: Case[] = [
	// --- heat-flow directions, surface resistances
	{
		name: 'masonry wall, horizontal, thermal data only',
		input: el({ heatFlow: 'horizontal', layers: masonry().map(({ mu: _mu, ...l }) => l) })
	},
	{
		name: 'flat roof, upward',
		input: el({
			heatFlow: 'upward',
			layers: [
				{ name: 'concrete deck', thicknessMm: 200, lambda: 2.3 },
				{ name: 'PIR board', thicknessMm: 120, lambda: 0.022 },
				{ name: 'membrane', thicknessMm: 3, resistance: 0 }
			]
		}),
		inverse: { layerIndex: 1, targetU: 0.15, products: [100, 120, 140, 160, 180] }
	},
	{
		name: 'floor over unheated space, downward',
		input: el({
			heatFlow: 'downward',
			layers: [
				{ name: 'timber boards', thicknessMm: 22, lambda: 0.13 },
				{ name: 'mineral wool', thicknessMm: 200, lambda: 0.037 }
			]
		})
	},
	{
		name: 'Rsi and Rse given',
		input: el({ heatFlow: 'horizontal', rsi: 0.2, rse: 0.1, layers: masonry() })
	},
	{
		name: 'Rsi and Rse zero (infinite film conductance)',
		input: el({
			heatFlow: 'horizontal',
			rsi: 0,
			rse: 0,
			layers: [{ name: 'board', thicknessMm: 100, lambda: 0.04, mu: 2 }],
			designTemperatures: { internal: 21, external: -3 }
		})
	},
	{
		name: 'one layer, upward, only thermal data',
		input: el({ heatFlow: 'upward', layers: [{ name: 'slab', thicknessMm: 200, lambda: 2.0 }] })
	},
	{
		name: 'resistance layers and zero-resistance membranes first and inside',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'foil', thicknessMm: 0.1, resistance: 0, sd: 1500 },
				{ name: 'panel', thicknessMm: 40, resistance: 1.25, sd: 2 },
				{ name: 'membrane', thicknessMm: 0.3, resistance: 0, sd: 0 },
				{ name: 'board', thicknessMm: 9, lambda: 0.17, mu: 200 }
			],
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COOL
		})
	},

	// --- air layers
	...(['upward', 'horizontal', 'downward'] as const).map((heatFlow): Case => ({
		name: `unventilated air layers by the table, ${heatFlow}`,
		input: el({
			heatFlow,
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21 },
				{ name: 'air 3 mm', thicknessMm: 3, air: 'unventilated' },
				{ name: 'air 12 mm', thicknessMm: 12, air: 'unventilated' },
				{ name: 'air 40 mm', thicknessMm: 40, air: 'unventilated' },
				{ name: 'air 200 mm', thicknessMm: 200, air: 'unventilated' },
				{ name: 'air 300 mm', thicknessMm: 300, air: 'unventilated' },
				{ name: 'air, R given', thicknessMm: 500, air: 'unventilated', resistance: 0.45 },
				{ name: 'air with λ', thicknessMm: 25, air: 'unventilated', lambda: 0.025, openingAreaMm2: 400 },
				{ name: 'block', thicknessMm: 100, lambda: 0.5 }
			]
		})
	})),
	{
		name: 'slightly ventilated air layer, resistance outside capped at 0.15',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.035, mu: 30 },
				{ name: 'cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 1000 },
				{ name: 'block', thicknessMm: 200, lambda: 0.5, mu: 8 }
			],
			internal: { temperature: 20, humidityClass: 3 },
			climate: COOL
		})
	},
	{
		name: 'slightly ventilated air layer, small resistance outside',
		input: el({
			heatFlow: 'upward',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21 },
				{ name: 'insulation', thicknessMm: 160, lambda: 0.035 },
				{ name: 'void', thicknessMm: 25, air: 'slightly-ventilated', openingAreaMm2: 600 },
				{ name: 'tile', thicknessMm: 10, lambda: 1.0 }
			]
		})
	},
	{
		name: 'slightly ventilated air layer whose path resistance would be negative',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'insulation', thicknessMm: 50, lambda: 0.035, mu: 1 },
				{ name: 'cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 1400 },
				{ name: 'block', thicknessMm: 300, lambda: 0.5, mu: 8 }
			],
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COLD
		})
	},
	{
		name: 'slightly ventilated air layer with a bridged layer outside and a well-ventilated one beyond',
		input: el({
			heatFlow: 'horizontal',
			rse: 0.06,
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
				{
					name: 'insulation between studs',
					thicknessMm: 100,
					lambda: 0.035,
					mu: 1,
					bridge: { lambda: 0.13, fraction: 0.12 }
				},
				{ name: 'air', thicknessMm: 20, air: 'slightly-ventilated', openingAreaMm2: 1500 },
				{
					name: 'battened board',
					thicknessMm: 50,
					lambda: 0.04,
					mu: 3,
					bridge: { lambda: 0.13, widthMm: 50, centresMm: 400 }
				},
				{ name: 'ventilated gap', thicknessMm: 25, air: 'well-ventilated', openingAreaMm2: 5000 },
				{ name: 'cladding', thicknessMm: 20, lambda: 0.13, mu: 50 }
			],
			internal: { temperature: 20, humidityClass: 2 },
			climate: COOL
		})
	},
	{
		name: 'well-ventilated cavity: Rse = Rsi, outer layers (one bridged) disregarded',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
				{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
				{
					name: 'mineral wool between studs',
					thicknessMm: 140,
					lambda: 0.035,
					mu: 1,
					bridge: { lambda: 0.13, widthMm: 38, centresMm: 600, mu: 50 }
				},
				{ name: 'OSB', thicknessMm: 12, lambda: 0.13, mu: 150, airGapLevel: 1 },
				{ name: 'wood fibre board', thicknessMm: 60, lambda: 0.045, mu: 5 },
				{ name: 'ventilated cavity', thicknessMm: 25, air: 'well-ventilated' },
				{
					name: 'brick on a bridged course',
					thicknessMm: 102,
					lambda: 0.77,
					mu: 10,
					airGapLevel: 2,
					fasteners: { lambda: 50, areaMm2: 12.6, perM2: 4 },
					bridge: { lambda: 1.2, fraction: 0.1 }
				}
			],
			internal: { temperature: 20, humidityClass: 3 },
			climate: COOL
		}),
		inverse: { layerIndex: 2, targetU: 0.2, products: [100, 140, 160, 200] }
	},
	{
		name: 'well-ventilated cavity with Rse given',
		input: el({
			heatFlow: 'upward',
			rse: 0.08,
			layers: [
				{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
				{ name: 'insulation', thicknessMm: 200, lambda: 0.04 },
				{ name: 'ventilated batten space', thicknessMm: 50, air: 'well-ventilated' },
				{ name: 'tiles', thicknessMm: 15, lambda: 1 }
			]
		})
	},

	// --- bridged layers (combined method)
	{
		name: 'timber-frame wall, two bridged layers, full moisture checks',
		input: el({
			heatFlow: 'horizontal',
			layers: timberFrame(),
			internal: { temperature: 20, humidityClass: 3 },
			climate: COOL
		}),
		override: { index: 5, thicknessMm: 180 },
		inverse: { layerIndex: 6, targetU: 0.15, products: [40, 60, 80, 100, 120, 140, 160] }
	},
	{
		name: 'bridged layer by member width and centres, bridge μ not given',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
				{
					name: 'insulation between studs',
					thicknessMm: 89,
					lambda: 0.038,
					mu: 1,
					bridge: { lambda: 0.12, widthMm: 38, centresMm: 400, name: 'studs' }
				},
				{ name: 'sheathing', thicknessMm: 11, lambda: 0.13, sd: 0.5 }
			],
			internal: { temperature: 21, relativeHumidity: 45 },
			climate: COLD
		})
	},
	{
		name: 'bridged by metal',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
				{
					name: 'insulation between steel studs',
					thicknessMm: 100,
					lambda: 0.035,
					mu: 1,
					bridge: { lambda: 50, fraction: 0.01, mu: 100000 }
				},
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, mu: 10 }
			],
			internal: { temperature: 20, relativeHumidity: 60 },
			climate: COLD
		})
	},
	{
		name: 'bridged beyond the combined method (R′T/R″T > 1.5), surface check across the bridges',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
				{
					name: 'insulation between concrete ribs',
					thicknessMm: 200,
					lambda: 0.02,
					mu: 30,
					bridge: { lambda: 2.0, fraction: 0.2, mu: 80 }
				},
				{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.1 }
			],
			internal: { temperature: 20, relativeHumidity: 65 },
			climate: COLD
		})
	},
	{
		name: 'three bridged layers, one of zero resistance, one with sd 0',
		input: el({
			heatFlow: 'downward',
			layers: [
				{
					name: 'board on battens',
					thicknessMm: 22,
					lambda: 0.13,
					sd: 0,
					bridge: { lambda: 0.13, fraction: 0.1, mu: 50 }
				},
				{
					name: 'membrane with clips',
					thicknessMm: 1,
					resistance: 0,
					sd: 2,
					bridge: { lambda: 0.5, fraction: 0.05 }
				},
				{
					name: 'insulation between joists',
					thicknessMm: 200,
					lambda: 0.037,
					mu: 1,
					bridge: { lambda: 0.13, widthMm: 50, centresMm: 600, mu: 20 }
				},
				{ name: 'deck', thicknessMm: 18, lambda: 0.13, mu: 150 }
			],
			internal: { temperature: 19, humidityClass: 2 },
			climate: COLD
		})
	},

	// --- roof spaces
	...(
		['tiles-no-felt', 'tiles-with-felt-or-boards', 'tiles-with-foil-lined-felt', 'boards-and-felt'] as const
	).map((roofSpace, k): Case => ({
		name: `ceiling under a roof space: ${roofSpace}`,
		input: el({
			heatFlow: 'upward',
			roofSpace,
			layers: ceiling(),
			...(k === 1 ? { internal: { temperature: 20, humidityClass: 3 }, climate: COOL } : {})
		}),
		...(k === 0 ? { inverse: { layerIndex: 3, targetU: 0.11 } } : {})
	})),

	// --- floors on the ground
	{
		name: 'ground floor, uninsulated (dt < B′)',
		input: el({ heatFlow: 'downward', layers: [slab], ground: { perimeterM: 40, areaM2: 100 } })
	},
	{
		name: 'ground floor, well insulated (dt ≥ B′), climate: surface check only',
		input: el({
			heatFlow: 'downward',
			layers: [screed, floorBoard, slab],
			ground: { perimeterM: 40, areaM2: 100 },
			internal: { temperature: 20, relativeHumidity: 55 },
			climate: COOL
		}),
		inverse: { layerIndex: 1, targetU: 0.12, products: [100, 150, 200] }
	},
	{
		name: 'ground floor, clay and a thick wall, internal conditions without a climate',
		input: el({
			heatFlow: 'downward',
			layers: [screed, { name: 'insulation', thicknessMm: 50, lambda: 0.035 }, { ...slab, mu: undefined }],
			ground: { perimeterM: 32, areaM2: 60, groundLambda: 1.5, wallThicknessM: 0.4 },
			internal: { temperature: 20, relativeHumidity: 50 }
		})
	},
	{
		name: 'ground floor with a bridged layer and a humidity class',
		input: el({
			heatFlow: 'downward',
			layers: [
				{ name: 'boards', thicknessMm: 22, lambda: 0.13 },
				{
					name: 'insulation between sleepers',
					thicknessMm: 100,
					lambda: 0.035,
					bridge: { lambda: 0.13, widthMm: 50, centresMm: 600 }
				},
				slab
			],
			ground: { perimeterM: 20, areaM2: 150, groundLambda: 3.5, wallThicknessM: 0 },
			internal: { temperature: 20, humidityClass: 4 },
			climate: COLD
		})
	},

	// --- ΔU corrections
	{
		name: 'air-gap level 0 only: nothing to add',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'block', thicknessMm: 100, lambda: 0.19 },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.022, airGapLevel: 0 },
				{ name: 'brick', thicknessMm: 102.5, lambda: 0.77 }
			]
		})
	},
	{
		name: 'air-gap level 1: below 3 %, omitted',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'block', thicknessMm: 100, lambda: 0.19 },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.022, airGapLevel: 1 },
				{ name: 'brick', thicknessMm: 102.5, lambda: 0.77 }
			]
		})
	},
	{
		name: 'air-gap level 1 below 3 %, applied as asked',
		input: el({
			heatFlow: 'horizontal',
			corrections: 'always',
			layers: [
				{ name: 'block', thicknessMm: 100, lambda: 0.19 },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.022, airGapLevel: 1 },
				{ name: 'brick', thicknessMm: 102.5, lambda: 0.77 }
			]
		})
	},
	{
		name: 'air-gap level 2 and steel fasteners: applied, not below 3 %',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'concrete', thicknessMm: 150, lambda: 2.0 },
				{
					name: 'insulation',
					thicknessMm: 120,
					lambda: 0.035,
					airGapLevel: 2,
					fasteners: { lambda: 50, areaMm2: 12.6, perM2: 6 }
				},
				{ name: 'render', thicknessMm: 10, lambda: 0.8 }
			]
		}),
		inverse: { layerIndex: 1, targetU: 0.25, products: [100, 120, 140, 160] }
	},
	{
		name: 'recessed fasteners only, standard rule',
		input: el({
			heatFlow: 'horizontal',
			corrections: 'standard',
			layers: [
				{ name: 'concrete', thicknessMm: 150, lambda: 2.0 },
				{
					name: 'insulation',
					thicknessMm: 160,
					lambda: 0.032,
					fasteners: { lambda: 17, areaMm2: 20, perM2: 8, penetrationMm: 120 }
				},
				{ name: 'render', thicknessMm: 10, lambda: 0.8 }
			]
		})
	},
	{
		name: 'plastic fasteners (λ < 1) only: no correction',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'concrete', thicknessMm: 150, lambda: 2.0 },
				{
					name: 'insulation',
					thicknessMm: 160,
					lambda: 0.032,
					fasteners: { lambda: 0.3, areaMm2: 30, perM2: 8 }
				},
				{ name: 'render', thicknessMm: 10, lambda: 0.8 }
			]
		})
	},
	{
		name: 'air gaps on two layers and plastic fasteners',
		input: el({
			heatFlow: 'upward',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, airGapLevel: 2 },
				{
					name: 'insulation',
					thicknessMm: 160,
					lambda: 0.032,
					airGapLevel: 1,
					fasteners: { lambda: 0.3, areaMm2: 30, perM2: 8 }
				},
				{ name: 'deck', thicknessMm: 18, lambda: 0.13 }
			]
		})
	},
	{
		name: 'plastic fasteners and air-gap level 0: both zero',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{
					name: 'insulation',
					thicknessMm: 100,
					lambda: 0.035,
					fasteners: { lambda: 0.5, areaMm2: 10, perM2: 4 }
				},
				{ name: 'board', thicknessMm: 10, lambda: 0.2, airGapLevel: 0 }
			]
		})
	},

	// --- rounding, design temperatures
	{
		name: 'rounding to 3 decimals',
		input: el({ heatFlow: 'horizontal', layers: masonry(), rounding: { mode: 'decimals', digits: 3 } })
	},
	{
		name: 'rounding to 2 significant figures',
		input: el({ heatFlow: 'horizontal', layers: masonry(), rounding: { mode: 'significant', digits: 2 } })
	},
	{
		name: 'rounding to 0 decimals',
		input: el({
			heatFlow: 'horizontal',
			layers: [{ name: 'glass', thicknessMm: 4, lambda: 1.0 }],
			rounding: { mode: 'decimals', digits: 0 }
		})
	},
	{
		name: 'design temperatures given, with a climate',
		input: el({
			heatFlow: 'horizontal',
			layers: masonry(),
			designTemperatures: { internal: 22, external: -12 },
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COOL
		})
	},
	{
		name: 'internal conditions without a climate',
		input: el({ heatFlow: 'horizontal', layers: masonry(), internal: { temperature: 18, humidityClass: 2 } })
	},

	// --- moisture: surface check and Glaser
	{
		name: 'masonry wall, fixed internal humidity, climate in scrambled order',
		input: el({
			heatFlow: 'horizontal',
			layers: masonry(),
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COOL_SCRAMBLED
		})
	},
	{
		name: 'solid wall fails the surface check',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
				{ name: 'solid brick', thicknessMm: 225, lambda: 0.77, mu: 10 }
			],
			internal: { temperature: 20, humidityClass: 5 },
			climate: COLD,
			surfaceRsi: 0.2
		})
	},
	{
		name: 'internal vapour pressure above saturation, surface condensation months',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
				{ name: 'insulation', thicknessMm: 60, lambda: 0.04, mu: 1 },
				{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.3 }
			],
			internal: { temperature: 10, humidityClass: 5 },
			climate: COLD
		})
	},
	{
		name: 'no month colder outside than inside',
		input: el({
			heatFlow: 'horizontal',
			layers: masonry(),
			internal: { temperature: 18, relativeHumidity: 60 },
			climate: HOT
		})
	},
	{
		name: 'membrane case: condensation in every month, accumulates',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'mineral wool', thicknessMm: 100, lambda: 0.04, mu: 1 },
				{ name: 'membrane', thicknessMm: 0.2, resistance: 0, sd: 10 }
			],
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: constant(0, 80)
		})
	},
	{
		name: 'starts after a dry month and dries out; acceptance limits exceeded',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.7, mu: 10 },
				{ name: 'mineral wool', thicknessMm: 200, lambda: 0.04, mu: 1 },
				{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.05 }
			],
			internal: { temperature: 20, humidityClass: 4 },
			climate: COOL,
			moistureLimits: { maxAtInterfaceGm2: 50, maxTotalGm2: 60 }
		})
	},
	{
		name: 'two condensation planes, accumulates, evaporation not required',
		input: el({
			heatFlow: 'horizontal',
			layers: twoPlanes(),
			internal: { temperature: 20, humidityClass: 4 },
			climate: COOL,
			moistureLimits: { requireEvaporation: false }
		})
	},
	{
		name: 'condensation zone inside thick insulation, lenient limits',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 15, lambda: 0.13, sd: 0.05 },
				{ name: 'mineral wool', thicknessMm: 300, lambda: 0.04, mu: 1 }
			],
			internal: { temperature: 20, relativeHumidity: 65 },
			climate: COLD,
			moistureLimits: { maxAtInterfaceGm2: 100000, maxTotalGm2: 100000, requireEvaporation: true }
		})
	},
	{
		name: 'air layers default to μ 1 in the condensation check',
		input: el({
			heatFlow: 'downward',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
				{ name: 'void', thicknessMm: 100, air: 'unventilated' },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.04, mu: 1 },
				{ name: 'deck', thicknessMm: 18, lambda: 0.13, mu: 150 }
			],
			internal: { temperature: 20, relativeHumidity: 40 },
			climate: COLD
		}),
		override: { index: 2, thicknessMm: 150 }
	},
	{
		name: 'thickness override of a layer with sd given',
		input: el({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21, sd: 0.2 },
				{
					name: 'insulation',
					thicknessMm: 100,
					lambda: 0.035,
					sd: 0.1,
					bridge: { lambda: 0.13, fraction: 0.1, mu: 20 }
				},
				{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.05 }
			],
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COOL
		}),
		override: { index: 1, thicknessMm: 160 }
	},

	// --- failing inputs
	{ name: 'not an object', input: null },
	{ name: 'no layers', input: { heatFlow: 'horizontal', layers: [] } },
	{
		name: 'several field errors at once',
		input: {
			heatFlow: 'sideways',
			rsi: -1,
			layers: [
				{ name: 'a', thicknessMm: 0, lambda: 0.04 },
				{ name: 'b', thicknessMm: 10, lambda: -1 },
				{ name: 'c', thicknessMm: Number.NaN, lambda: 1 },
				{ name: 'd', thicknessMm: '10', lambda: 1 },
				{ name: 'e', thicknessMm: 10, lambda: 1, resistance: 1 },
				{ name: 'f', thicknessMm: 10, lambda: 1, bridge: { lambda: 0.13, fraction: 1.5 } },
				{ name: 'g', thicknessMm: 50, air: 'slightly-ventilated' }
			]
		}
	},
	{
		name: 'climate of 11 months and no internal conditions',
		input: { heatFlow: 'horizontal', layers: masonry(), climate: COOL.slice(0, 11) }
	},
	{
		name: 'ground with the wrong direction and a roof space',
		input: {
			heatFlow: 'upward',
			layers: [slab],
			ground: { perimeterM: 0, areaM2: 100 },
			roofSpace: 'tiles-no-felt'
		}
	},
	{
		name: 'missing μ with a climate',
		input: {
			heatFlow: 'horizontal',
			layers: [{ name: 'a', thicknessMm: 100, lambda: 0.04 }],
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COOL
		}
	},
	{
		name: 'zero total resistance',
		input: {
			heatFlow: 'horizontal',
			rsi: 0,
			rse: 0,
			layers: [{ name: 'foil', thicknessMm: 0.1, resistance: 0 }]
		}
	}
];

/* ------------------------------------------------------------------ running and encoding */

/**
 * JSON-safe copy that keeps what JSON would lose: −0, ±Infinity, NaN, keys whose value is
 * undefined and array holes are written as tagged objects; key order is kept.
 */
export function encode(v: unknown): unknown {
	if (v === undefined) return { $: 'undefined' };
	if (typeof v === 'number') {
		if (Object.is(v, -0)) return { $: '-0' };
		if (!Number.isFinite(v)) return { $: String(v) };
		return v;
	}
	if (Array.isArray(v))
		return Array.from({ length: v.length }, (_, i) => (i in v ? encode(v[i]) : { $: 'hole' }));
	if (v instanceof Error) {
		const out: Record<string, unknown> = { $error: v.name, message: v.message };
		for (const k of Object.keys(v)) out[k] = encode((v as unknown as Record<string, unknown>)[k]);
		return out;
	}
	if (typeof v === 'object' && v !== null) {
		const out: Record<string, unknown> = {};
		for (const k of Object.keys(v)) out[k] = encode((v as Record<string, unknown>)[k]);
		return out;
	}
	return v;
}

const attempt = (fn: () => unknown): unknown => {
	try {
		return { value: fn() };
	} catch (e) {
		return { threw: e };
	}
};

/** Marks an analysis of the parsed input identical to that of the raw input. */
export const SAME_AS_RAW = { $: 'same as analyseRaw' } as const;

/** Every call of one case, encoded: parse, analyse raw, analyse parsed, the model, the inverse. */
export function runCase(c: Case): Record<string, unknown> {
	const parsed = parseElementInput(structuredClone(c.input));
	const out: Record<string, unknown> = {
		parse: parsed.ok ? { ok: true } : parsed,
		analyseRaw: attempt(() => analyseElement(structuredClone(c.input) as ElementInput))
	};
	if (parsed.ok) {
		// Stored once when it matches the raw call bit for bit (it always has so far).
		const viaParsed = encode(attempt(() => analyseElement(parsed.data)));
		out.analyseParsed =
			JSON.stringify(viaParsed) === JSON.stringify(encode(out.analyseRaw)) ? SAME_AS_RAW : viaParsed;
		out.model = attempt(() => buildThermalModel(parsed.data));
		if (c.override) out.modelOverride = attempt(() => buildThermalModel(parsed.data, c.override));
		if (c.inverse) {
			const { layerIndex, targetU, products } = c.inverse;
			out.inverse = attempt(() => solveThicknessDetailed(parsed.data, layerIndex, targetU, products));
		}
	}
	return encode(out) as Record<string, unknown>;
}

/** Path of the fixture, relative to the repository root. */
export const FIXTURE_PATH = 'tests/physics/fixtures/element-characterisation.json';
