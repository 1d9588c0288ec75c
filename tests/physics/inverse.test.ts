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
