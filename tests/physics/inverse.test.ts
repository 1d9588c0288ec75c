// Thickness of one layer for a target U (the inverse of ISO 6946:2017 6.7.1 / 6.7.2, from memory).
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	ElementInputError,
	solveThickness,
	solveThicknessDetailed,
	type ElementInput
} from '../../src/lib/physics';

const cavityWall = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
		{ name: 'insulation', thicknessMm: 50, lambda: 0.035 },
		{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
	]
});

describe('solveThickness', () => {
	it('closed form for a homogeneous layer: d = λ·(1/U − R_rest)', () => {
		// R_rest = 0.13 + 0.0125/0.21 + 0.102/0.77 + 0.04 = 0.361991; 1/0.25 − R_rest = 3.638009 → d = 127.330 mm
		const d = solveThickness(cavityWall(), 1, 0.25);
		expect(d).toBeCloseTo(127.33032, 4);
		const check = cavityWall();
		check.layers[1].thicknessMm = d;
		expect(analyseElement(check).uValue).toBeCloseTo(0.25, 12);
	});

	it('rounds up to the next product thickness', () => {
		const s = solveThicknessDetailed(cavityWall(), 1, 0.25, [160, 100, 120, 140]);
		expect(s.method).toBe('closed-form');
		expect(s.roundedMm).toBe(140);
		expect(s.uAtRounded!).toBeLessThan(0.25);
		const none = solveThicknessDetailed(cavityWall(), 1, 0.25, [50, 100]);
		expect(none.roundedMm).toBeNull();
		expect(none.notes.join(' ')).toMatch(/largest is 100 mm/);
	});

	it('bridged layer (combined method) and ΔU corrections by bisection, exact to the forward U', () => {
		const input: ElementInput = {
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
				{
					name: 'mineral wool between studs',
					thicknessMm: 140,
					lambda: 0.04,
					bridge: { lambda: 0.12, fraction: 0.15 },
					airGapLevel: 2
				},
				{ name: 'sheathing', thicknessMm: 9, lambda: 0.13 },
				{ name: 'cavity', thicknessMm: 50, air: 'unventilated' },
				{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
			]
		};
		const s = solveThicknessDetailed(input, 1, 0.2);
		expect(s.method).toBe('bisection');
		const at = structuredClone(input);
		at.layers[1].thicknessMm = s.exactMm;
		const fwd = analyseElement(at);
		expect(fwd.correctionsApplied).toBe(true);
		expect(Math.abs(fwd.uValue - 0.2)).toBeLessThan(1e-9);
		expect(s.uAtExact).toBeCloseTo(fwd.uValue, 12);
	});

	it('returns 0 when the other layers already reach the target', () => {
		expect(solveThickness(cavityWall(), 1, 3)).toBe(0);
	});

	it('refuses layers whose thickness cannot be solved for, with the field named', () => {
		const air: ElementInput = {
			...cavityWall(),
			layers: [...cavityWall().layers, { name: 'air', thicknessMm: 50, air: 'unventilated' }]
		};
		expect(() => solveThickness(air, 3, 0.2)).toThrow(ElementInputError);
		expect(() => solveThickness(air, 3, 0.2)).toThrow(/layers\.3\.air/);
		const byR: ElementInput = {
			heatFlow: 'horizontal',
			layers: [{ name: 'panel', thicknessMm: 50, resistance: 2 }]
		};
		expect(() => solveThickness(byR, 0, 0.2)).toThrow(/layers\.0\.lambda/);
		expect(() => solveThickness(cavityWall(), 7, 0.2)).toThrow(/layerIndex/);
		expect(() => solveThickness(cavityWall(), 1, Number.NaN)).toThrow(/targetU/);
	});
});

// "Thickness to meet the limit" when the element already meets it. The roof (heat flow upward:
// Rsi 0.10, Rse 0.04 m²·K/W, ISO 6946:2017 Table 7) of plasterboard 12.5 mm (λ 0.21), PIR 170 mm
// (λ 0.023) and a plywood deck 18 mm (λ 0.13): U = 1/ΣR = 0.129 → 0.13 W/(m²·K), against 0.16.
// The product sizes are the editor's list (common practice, no source).
const SIZES = [
	20, 25, 30, 40, 50, 60, 70, 75, 80, 90, 100, 110, 120, 125, 130, 140, 150, 160, 170, 180, 200, 220, 240,
	250, 260, 280, 300, 320, 350, 400
];
const roof = (pirMm = 170): ElementInput => ({
	heatFlow: 'upward',
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
		{ name: 'PIR board', thicknessMm: pirMm, lambda: 0.023 },
		{ name: 'plywood deck', thicknessMm: 18, lambda: 0.13 }
	]
});
/** U of the roof with `pirMm` of PIR, by hand: 1/(Rsi + Σd/λ + Rse), ISO 6946:2017 6.7.1. */
const handU = (pirMm: number) => 1 / (0.1 + 0.0125 / 0.21 + pirMm / 1000 / 0.023 + 0.018 / 0.13 + 0.04);

describe('solveThicknessDetailed: a layer that already meets the target', () => {
	it('says it already meets, with the thickness and U as entered, and proposes no thinner layer by default', () => {
		expect(handU(170)).toBeCloseTo(0.129378, 6);
		const s = solveThicknessDetailed(roof(), 1, 0.16, SIZES);
		expect(s.outcome).toBe('meets');
		expect(s.currentMm).toBe(170);
		expect(s.uCurrent).toBeCloseTo(handU(170), 12);
		expect(s.uCurrentRounded).toBe(0.13);
		expect(s.roundedMm).toBeNull();
		expect(s.uAtRounded).toBeNull();
		expect(s.notes.join(' ')).toMatch(/already reaches the target U = 0\.16 W\/\(m²·K\): U = 0\.13/);
	});

	it('asked for the thinnest: the thinnest product size whose 1/ΣR meets the target, checked by hand', () => {
		const s = solveThicknessDetailed(roof(), 1, 0.16, SIZES, { mode: 'thinnest' });
		expect(s.outcome).toBe('thinner');
		// independent: the smallest size d of the list with 1/(Rsi + ΣR(d) + Rse) ≤ 0.16
		const expected = SIZES.find((d) => handU(d) <= 0.16)!;
		expect(expected).toBe(140); // d = 0.023·(1/0.16 − 0.337985)·1000 = 135.98 mm → 140
		expect(s.roundedMm).toBe(expected);
		expect(s.uAtRounded!).toBeCloseTo(handU(140), 12);
		expect(handU(130)).toBeGreaterThan(0.16); // the next size down does not meet
		expect(s.exactMm).toBeCloseTo(0.023 * (1 / 0.16 - (0.1 + 0.0125 / 0.21 + 0.018 / 0.13 + 0.04)) * 1000, 9);
	});

	it('asked for the thinnest when no thinner size meets: says so, proposes nothing', () => {
		const s = solveThicknessDetailed(roof(140), 1, 0.16, SIZES, { mode: 'thinnest' });
		expect(s.outcome).toBe('thinnest');
		expect(s.roundedMm).toBeNull();
	});

	it('a layer that does not meet is thickened to the next product size, in either mode', () => {
		for (const mode of ['meet', 'thinnest'] as const) {
			const s = solveThicknessDetailed(roof(100), 1, 0.16, SIZES, { mode });
			expect(s.outcome).toBe('thicker');
			expect(s.roundedMm).toBe(140);
		}
	});

	it('judges "already meets" on U as reported: 0.1604 reported as 0.16 meets 0.16', () => {
		// d with 1/U = 1/0.1604: d = 0.023·(1/0.1604 − 0.337985)·1000 = 135.63 mm; U as reported 0.16
		const d = 0.023 * (1 / 0.1604 - (0.1 + 0.0125 / 0.21 + 0.018 / 0.13 + 0.04)) * 1000;
		const s = solveThicknessDetailed(roof(d), 1, 0.16, SIZES);
		expect(s.uCurrent).toBeGreaterThan(0.16);
		expect(s.outcome).toBe('meets');
	});
});
