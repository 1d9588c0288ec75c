// Floors on the ground (ISO 13370:2017, 8.1 slab on ground; ground conductivity Table 7) and roof
// spaces above insulated ceilings (ISO 6946:2017, Table 9; Table 3 in the 2007 edition). Formulas and table values of both standards are
// quoted FROM MEMORY; every expected number is a hand calculation shown beside it. No published
// worked example is reproduced: none is recalled reliably enough to quote.
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	characteristicDimension,
	GROUND_LAMBDA,
	GROUND_LAMBDA_DEFAULT,
	groundKindOf,
	parseElementInput,
	ROOF_SPACE_RESISTANCE,
	slabOnGroundU,
	solveThickness,
	type ElementInput
} from '../../src/lib/physics';
import { coolClimate } from './helpers';

const concrete = { name: 'concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 }; // R = 0.15/1.5 = 0.1
const insulation = { name: 'insulation board', thicknessMm: 100, lambda: 0.035, mu: 50 }; // R = 0.1/0.035 = 2.857143

const floor = (layers: ElementInput['layers'], ground: ElementInput['ground']): ElementInput => ({
	heatFlow: 'downward',
	layers,
	ground
});

describe('ISO 13370 slab on ground (formulas from memory)', () => {
	it("B' = A / (0.5·P)", () => {
		// 100 m², 40 m of exposed perimeter: 100 / 20 = 5 m
		expect(characteristicDimension(100, 40)).toBe(5);
	});

	it('ground conductivity: 2.0 W/(m·K) when unknown; clay/silt 1.5, sand/gravel 2.0, rock 3.5 (ISO 13370:2017 Table 7, from memory)', () => {
		expect(GROUND_LAMBDA_DEFAULT).toBe(2.0);
		expect(GROUND_LAMBDA['clay-or-silt']).toBe(1.5);
		expect(GROUND_LAMBDA['sand-or-gravel']).toBe(2.0);
		expect(GROUND_LAMBDA['homogeneous-rock']).toBe(3.5);
	});

	it('uninsulated floor, dt < B′: U = 2λ/(πB′ + dt)·ln(πB′/dt + 1)', () => {
		// Rsi 0.17, Rf 0.1, Rse 0.04, w 0.3, λg 2.0: dt = 0.3 + 2·0.31 = 0.92 m < B′ = 5 m
		// U = 4/(15.70796 + 0.92)·ln(15.70796/0.92 + 1) = 0.240559·2.894466 = 0.696289
		const g = slabOnGroundU({ perimeterM: 40, areaM2: 100 }, 0.17, 0.1, 0.04);
		expect(g.equivalentThicknessM).toBeCloseTo(0.92, 12);
		expect(g.regime).toBe('dt < B′');
		expect(g.u).toBeCloseTo(0.6962891, 6);
	});

	it('well-insulated floor, dt ≥ B′: U = λ/(0.457·B′ + dt)', () => {
		// Rf = 2.857143 + 0.1 = 2.957143; dt = 0.3 + 2·(0.17 + 2.957143 + 0.04) = 6.634286 m ≥ 5 m
		// U = 2/(0.457·5 + 6.634286) = 2/8.919286 = 0.224233
		const g = slabOnGroundU({ perimeterM: 40, areaM2: 100 }, 0.17, 2.957143, 0.04);
		expect(g.regime).toBe('dt ≥ B′');
		expect(g.u).toBeCloseTo(0.2242332, 6);
	});

	it('clay ground and a thicker wall', () => {
		// A 60 m², P 32 m: B′ = 3.75 m; 50 mm of λ 0.035 (R 1.428571) on the slab: Rf = 1.528571
		// dt = 0.4 + 1.5·(0.17 + 1.528571 + 0.04) = 3.007857 m < 3.75 m
		// U = 3/(11.780972 + 3.007857)·ln(11.780972/3.007857 + 1) = 0.323077
		const g = slabOnGroundU(
			{ perimeterM: 32, areaM2: 60, groundLambda: 1.5, wallThicknessM: 0.4 },
			0.17,
			0.05 / 0.035 + 0.1,
			0.04
		);
		expect(g.equivalentThicknessM).toBeCloseTo(3.0078571, 6);
		expect(g.u).toBeCloseTo(0.3230771, 6);
	});

	it('analyseElement reports the floor U by ISO 13370 and keeps the build-up U', () => {
		const r = analyseElement(floor([concrete], { perimeterM: 40, areaM2: 100 }));
		// build-up alone: RT = 0.17 + 0.1 + 0.04 = 0.31, U = 3.2258 (as if exposed to outside air)
		expect(r.rBuildUp).toBeCloseTo(0.31, 12);
		expect(r.uBuildUp).toBeCloseTo(1 / 0.31, 12);
		expect(r.uValue).toBeCloseTo(0.6962891, 6);
		expect(r.uValueRounded).toBe(0.7);
		// equivalent RT = 1/U = 1.436185; the ground adds 1.436185 − 0.31 = 1.126185
		expect(r.rTotal).toBeCloseTo(1.436185, 6);
		expect(r.ground?.rGround).toBeCloseTo(1.126185, 6);
		expect(r.ground?.characteristicDimensionM).toBe(5);
		expect(r.notes.some((n) => n.includes('ISO 13370'))).toBe(true);
	});

	it('the profile uses the equivalent resistance: the underside of the slab sits between inside and outside', () => {
		const r = analyseElement({
			...floor([concrete], { perimeterM: 40, areaM2: 100 }),
			designTemperatures: { internal: 20, external: 0 }
		});
		// q = 20/1.436185 = 13.9258 W/m²; θsi = 20 − 13.9258·0.17 = 17.6326; underside = 20 − q·0.27 = 16.2400
		const q = 20 / 1.436185;
		expect(r.heatFlux).toBeCloseTo(q, 4);
		expect(r.interfaces[0].temperature).toBeCloseTo(20 - q * 0.17, 3);
		expect(r.interfaces[1].temperature).toBeCloseTo(20 - q * 0.27, 3);
	});

	it('no Glaser check against the outside climate; the surface factor is computed with the equivalent RT', () => {
		const r = analyseElement({
			...floor([{ ...concrete, mu: undefined }], { perimeterM: 40, areaM2: 100 }),
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: coolClimate()
		});
		expect(r.condensation).toBeUndefined();
		expect(r.notes.some((n) => n.includes('not assessed for a floor in contact with the ground'))).toBe(true);
		// fRsi with Rsi 0.25 in place of 0.17 (ISO 13788:2012, clause 5, from memory):
		// RT′ = 1.436185 − 0.17 + 0.25 = 1.516185; fRsi = 1 − 0.25/1.516185 = 0.835112
		expect(r.surface?.fRsi).toBeCloseTo(1 - 0.25 / 1.516185, 5);
	});

	it('without ground data a downward-heat-flow element is an exposed floor, as before', () => {
		const r = analyseElement({ heatFlow: 'downward', layers: [concrete] });
		expect(r.rTotal).toBeCloseTo(0.31, 12); // 0.17 + 0.1 + 0.04
		expect(r.ground).toBeUndefined();
		expect(r.uBuildUp).toBeUndefined();
	});

	it('thickness for a target U is solved through the ISO 13370 expression', () => {
		const input = floor([{ ...insulation, thicknessMm: 50 }, concrete], { perimeterM: 40, areaM2: 100 });
		const d = solveThickness(input, 0, 0.2);
		const check = analyseElement({ ...input, layers: [{ ...insulation, thicknessMm: d }, concrete] });
		expect(check.uValue).toBeCloseTo(0.2, 9);
	});

	it('names the field when the ground data is wrong', () => {
		const bad = parseElementInput({
			heatFlow: 'horizontal',
			layers: [concrete],
			ground: { perimeterM: -1, areaM2: 100, groundLambda: 0 }
		});
		expect(bad.ok).toBe(false);
		const paths = bad.ok ? [] : bad.issues.map((i) => i.path);
		expect(paths).toContain('ground.perimeterM');
		expect(paths).toContain('ground.groundLambda');
		expect(paths).toContain('ground'); // not a floor: heat flow horizontal

		// P is the exposed perimeter (ISO 13370, from memory: party walls are left out), so a mid-terrace
		// floor of 100 m² with only 2 × 6 m of external wall is valid
		expect(parseElementInput(floor([concrete], { perimeterM: 12, areaM2: 100 })).ok).toBe(true);
		const zero = parseElementInput(floor([concrete], { perimeterM: 0, areaM2: 100 }));
		expect(zero.ok ? [] : zero.issues.map((i) => i.path)).toEqual(['ground.perimeterM']);

		const missing = parseElementInput({
			heatFlow: 'downward',
			layers: [concrete],
			ground: { perimeterM: 40 }
		});
		expect(missing.ok ? [] : missing.issues.map((i) => i.path)).toEqual(['ground.areaM2']);
	});
});

describe('the ground λ and where it comes from (ISO 13370:2017, Table 7, from memory)', () => {
	const slab = (groundLambda?: number) =>
		analyseElement(
			floor([concrete], { perimeterM: 40, areaM2: 100, ...(groundLambda ? { groundLambda } : {}) })
		);
	// B′ = 5 m; dt = 0.3 + λ·(0.17 + 0.1 + 0.04) = 0.3 + 0.31·λ < B′: U = 2λ/(π·5 + dt)·ln(π·5/dt + 1)
	const handU = (lambda: number) => {
		const dt = 0.3 + lambda * 0.31;
		return ((2 * lambda) / (Math.PI * 5 + dt)) * Math.log((Math.PI * 5) / dt + 1);
	};

	it('not given: 2.0 W/(m·K), the conventional value where the ground is not known', () => {
		const r = slab();
		expect(r.ground!.groundLambda).toBe(2.0);
		expect(r.uValue).toBeCloseTo(handU(2.0), 12);
		expect(r.ground!.groundLambdaSource).toMatch(
			/^not given: the conventional value where the ground is not known \(ISO 13370:2017, Table 7, from memory/
		);
		expect(r.notes).toContain(
			`Ground thermal conductivity λg = 2.0 W/(m·K), ${r.ground!.groundLambdaSource}.`
		);
	});

	it('clay or silt 1.5, sand or gravel 2.0, rock 3.5: each named as the table gives it', () => {
		for (const [lambda, words] of [
			[1.5, 'clay or silt'],
			[2.0, 'sand or gravel, also the value where the ground is not known'],
			[3.5, 'homogeneous rock']
		] as const) {
			const r = slab(lambda);
			expect(r.uValue).toBeCloseTo(handU(lambda), 12);
			expect(r.ground!.groundLambdaSource).toMatch(
				new RegExp(`^as given: the value for ${words} \\(ISO 13370`)
			);
		}
		expect(groundKindOf(1.5)).toBe('clay-or-silt');
		expect(groundKindOf(1.8)).toBeNull();
	});

	it('another value: as given', () => {
		const r = slab(1.8);
		expect(r.uValue).toBeCloseTo(handU(1.8), 12);
		expect(r.ground!.groundLambdaSource).toBe('as given');
		expect(r.notes).toContain('Ground thermal conductivity λg = 1.8 W/(m·K), as given.');
	});
});

describe('roof space above an insulated ceiling (ISO 6946:2017 Table 9, from memory; Table 3 in the 2007 edition)', () => {
	const ceiling = (roofSpace?: ElementInput['roofSpace']): ElementInput => ({
		heatFlow: 'upward',
		layers: [
			{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.25 }, // R = 0.05
			{ name: 'mineral wool', thicknessMm: 200, lambda: 0.04 } // R = 5.0
		],
		...(roofSpace ? { roofSpace } : {})
	});

	it('Ru 0.06 / 0.2 / 0.3 / 0.3 m²·K/W', () => {
		expect(ROOF_SPACE_RESISTANCE['tiles-no-felt']).toBe(0.06);
		expect(ROOF_SPACE_RESISTANCE['tiles-with-felt-or-boards']).toBe(0.2);
		expect(ROOF_SPACE_RESISTANCE['tiles-with-foil-lined-felt']).toBe(0.3);
		expect(ROOF_SPACE_RESISTANCE['boards-and-felt']).toBe(0.3);
	});

	it('is added to RT', () => {
		// without: RT = 0.10 + 0.05 + 5.0 + 0.04 = 5.19; with felt under tiles: 5.19 + 0.2 = 5.39
		expect(analyseElement(ceiling()).rTotal).toBeCloseTo(5.19, 12);
		const r = analyseElement(ceiling('tiles-with-felt-or-boards'));
		expect(r.rTotal).toBeCloseTo(5.39, 12);
		expect(r.uValue).toBeCloseTo(1 / 5.39, 12);
		expect(r.rRoofSpace).toBe(0.2);
		expect(r.rse).toBe(0.04);
		expect(r.notes.some((n) => n.includes('Ru = 0.2'))).toBe(true);
		// the note names the table; the report's method section reads the source out of its parentheses
		expect(r.notes).toContain(
			'Roof space above the ceiling (tiles with felt or boards under them): Ru = 0.2 m²·K/W (ISO 6946:2017, Table 9, from memory; Table 3 in the 2007 edition) is added to RT between the last layer and Rse.'
		);
	});

	it('sits between the last layer and Rse in the profile', () => {
		const r = analyseElement({
			...ceiling('tiles-no-felt'),
			designTemperatures: { internal: 20, external: 0 }
		});
		// RT = 5.19 + 0.06 = 5.25; q = 20/5.25 = 3.809524; top of the wool = 0 + q·(0.06 + 0.04) = 0.380952
		expect(r.heatFlux).toBeCloseTo(20 / 5.25, 9);
		expect(r.interfaces[2].temperature).toBeCloseTo((20 / 5.25) * 0.1, 9);
	});

	it('needs upward heat flow and no well-ventilated layer', () => {
		const bad = parseElementInput({ ...ceiling('boards-and-felt'), heatFlow: 'horizontal' });
		expect(bad.ok ? [] : bad.issues.map((i) => i.path)).toEqual(['roofSpace']);
		const wrong = parseElementInput({ ...ceiling(), roofSpace: 'thatch' });
		expect(wrong.ok ? [] : wrong.issues.map((i) => i.path)).toEqual(['roofSpace']);
	});
});

describe('corrections notes speak only of what was entered', () => {
	const wall: ElementInput = {
		heatFlow: 'horizontal',
		layers: [{ name: 'insulation', thicknessMm: 100, lambda: 0.035 }]
	};
	it('nothing entered: says so and does not mention the 3 % rule', () => {
		const r = analyseElement(wall);
		expect(r.notes.some((n) => n.includes('no air-gap level and no fasteners entered'))).toBe(true);
		expect(r.notes.some((n) => n.includes('3 %'))).toBe(false);
	});
	it('a correction below 3 % of U: names the rule and what was not entered', () => {
		// level 1: ΔU = 0.01·(2.857143/3.027143)² = 0.008908; U = 0.330344; 2.7 % < 3 % → omitted
		const r = analyseElement({ ...wall, layers: [{ ...wall.layers[0], airGapLevel: 1 }] });
		expect(r.deltaUAirGaps).toBeCloseTo(0.01 * (2.857143 / 3.027143) ** 2, 6);
		expect(r.correctionsApplied).toBe(false);
		expect(r.notes.some((n) => n.includes('below 3 %'))).toBe(true);
		expect(r.notes.some((n) => n.includes('No fasteners entered'))).toBe(true);
	});
});
