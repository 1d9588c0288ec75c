// Heated and unheated basements by ISO 13370:2017, 8.3 and 8.4 (formulas quoted FROM MEMORY).
// Checked against an independent Python/numpy implementation of the same formulas
// (tests/physics/reference/iso13370.py, written from the formulas, not from the engine's code),
// hand calculations shown beside the numbers, and limits: a floor at depth z → 0 is the slab on
// ground of ./ground; an unheated basement open to the outside air leaves only the floor above it.
// No published worked example is reproduced. The basements are invented.
import { describe, expect, it } from 'vitest';
import {
	analyseHeatedBasement,
	analyseUnheatedBasement,
	parseHeatedBasementInput,
	parseUnheatedBasementInput,
	type HeatedBasementInput,
	type UnheatedBasementInput
} from '../../src/lib/physics/ground-basement';
import { GROUND_LAMBDA, slabOnGroundU } from '../../src/lib/physics/ground';
import { numpyVersion, referenceTitle, runReference } from './reference/python';

const heated: HeatedBasementInput = { perimeterM: 40, areaM2: 100, depthM: 2.5, floorR: 0.5, wallR: 1.5 };
const unheated: UnheatedBasementInput = {
	...heated,
	floorR: 0,
	wallR: 0.2,
	floorU: 0.5,
	wallAboveGroundHeightM: 0.5,
	wallAboveGroundU: 1.5,
	airChangeRate: 0.3,
	volumeM3: 250
};
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('ISO 13370 heated basement: hand calculation and limits (formulas from memory)', () => {
	it('Ubf, Ubw, H and U′ of a 2.5 m deep basement', () => {
		// B′ = 5 m, λ 2.0, w 0.3: dt = 0.3 + 2·(0.17 + 0.5 + 0.04) = 1.72 m; dw = 2·(0.13 + 1.5 + 0.04) = 3.34 m
		// dt + z/2 = 2.97 < 5: Ubf = 4/(5π + 2.97)·ln(5π/2.97 + 1) = 0.214156·1.838782 = 0.393786
		// dw ≥ dt: Ubw = 4/(2.5π)·(1 + 0.86/4.22)·ln(2.5/3.34 + 1) = 0.509296·1.203791·0.558760 = 0.342568
		// H = 100·0.393786 + 2.5·40·0.342568 = 39.3786 + 34.2568 = 73.6354 W/K; U′ = 73.6354/200 = 0.368177
		const r = analyseHeatedBasement(heated);
		expect(r.floorEquivalentThicknessM).toBeCloseTo(1.72, 12);
		expect(r.wallEquivalentThicknessM).toBeCloseTo(3.34, 12);
		expect(r.floorRegime).toBe('(dt + z/2) < B′');
		expect(r.ubf).toBeCloseTo(0.393786, 6);
		expect(r.ubw).toBeCloseTo(0.342568, 6);
		expect(r.wallUsedDw).toBe(false);
		expect(r.heatTransferCoefficient).toBeCloseTo(73.6354, 3);
		expect(r.u).toBeCloseTo(0.368177, 6);
	});

	it('walls less resistant than the floor: dw takes dt’s place in Ubw', () => {
		// floorR 3 (dt = 0.3 + 2·3.21 = 6.72 m), wallR 0 (dw = 2·0.17 = 0.34 m): d = dw
		// Ubw = 4/(2.5π)·(1 + 0.17/2.84)·ln(2.5/0.34 + 1) = 0.509296·1.059859·2.122614 = 1.145748
		const r = analyseHeatedBasement({ ...heated, floorR: 3, wallR: 0 });
		expect(r.wallUsedDw).toBe(true);
		expect(r.ubw).toBeCloseTo(1.145748, 6);
		// dt + z/2 = 7.97 ≥ 5: Ubf = 2/(0.457·5 + 7.97) = 0.195027
		expect(r.floorRegime).toBe('(dt + z/2) ≥ B′');
		expect(r.ubf).toBeCloseTo(2 / (0.457 * 5 + 7.97), 12);
	});

	it('z → 0: the basement floor is the slab on ground of ISO 13370, 8.1', () => {
		for (const floorR of [0.5, 3]) {
			const r = analyseHeatedBasement({ ...heated, floorR, depthM: 1e-9 });
			const slab = slabOnGroundU({ perimeterM: 40, areaM2: 100 }, 0.17, floorR, 0.04);
			expect(rel(r.ubf, slab.u)).toBeLessThan(1e-9);
			expect(rel(r.u, slab.u)).toBeLessThan(1e-6); // the walls' z·P vanishes beside A
		}
	});

	it('a kind of ground gives its λ; the method, cautions and λ note are carried', () => {
		const r = analyseHeatedBasement({ ...heated, groundKind: 'homogeneous-rock' });
		expect(r.groundLambda).toBe(GROUND_LAMBDA['homogeneous-rock']);
		expect(r.notes[0]).toMatch(/homogeneous rock/);
		expect(r.method.join(' ')).toMatch(/8\.3.*Ubw = 2λ\/\(π·z\)/);
		expect(r.cautions.some((c) => c.includes('steady-state'))).toBe(true);
	});
});

describe('ISO 13370 unheated basement (formulas from memory)', () => {
	it('1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V)', () => {
		// dt = 0.3 + 2·0.21 = 0.72 m; dw = 2·(0.13 + 0.2 + 0.04) = 0.74 m ≥ dt
		// Ubf = 4/(5π + 1.97)·ln(5π/1.97 + 1) = 0.226270·2.194285 = 0.496502
		// Ubw = 4/(2.5π)·(1 + 0.36/3.22)·ln(2.5/0.74 + 1) = 0.509296·1.111801·1.476678 = 0.836148
		// loss = 49.6502 + 83.6148 + 0.5·40·1.5 + 0.33·0.3·250 = 49.6502 + 83.6148 + 30 + 24.75 = 188.0150 W/K
		// U = 1/(1/0.5 + 100/188.0150) = 1/2.531873 = 0.394965
		const r = analyseUnheatedBasement(unheated);
		expect(r.ubf).toBeCloseTo(0.496502, 6);
		expect(r.ubw).toBeCloseTo(0.836148, 6);
		expect(r.ventilationCoefficient).toBeCloseTo(24.75, 12);
		expect(r.basementLossCoefficient).toBeCloseTo(188.015, 3);
		expect(r.u).toBeCloseTo(0.394965, 6);
	});

	it('a basement open to the outside air leaves the floor above it: U → Uf', () => {
		const r = analyseUnheatedBasement({ ...unheated, airChangeRate: 100, volumeM3: 1e7 });
		expect(rel(r.u, 0.5)).toBeLessThan(1e-4);
		// and an airtight one with no walls above the ground: only the ground takes the heat
		const tight = analyseUnheatedBasement({ ...unheated, airChangeRate: 0, wallAboveGroundHeightM: 0 });
		expect(tight.u).toBeCloseTo(1 / (1 / 0.5 + 100 / (100 * tight.ubf + 100 * tight.ubw)), 14);
	});
});

describe.skipIf(!numpyVersion)(
	`ISO 13370 basements against the Python/numpy reference (${referenceTitle})`,
	() => {
		const heatedCases: HeatedBasementInput[] = [
			heated,
			{ ...heated, floorR: 3, wallR: 0 },
			{ ...heated, areaM2: 48, perimeterM: 28, depthM: 1.2, groundLambda: 1.5, wallThicknessM: 0.45 },
			{ ...heated, depthM: 6, groundKind: 'homogeneous-rock', floorR: 8, wallR: 4 }
		];
		const unheatedCases: UnheatedBasementInput[] = [
			unheated,
			{ ...unheated, airChangeRate: 3, groundLambda: 1.5, floorR: 1 },
			{ ...unheated, depthM: 0.8, floorU: 2.5, wallAboveGroundHeightM: 1.2, volumeM3: 0 }
		];
		const common = (c: HeatedBasementInput) => ({
			areaM2: c.areaM2,
			perimeterM: c.perimeterM,
			lambda: c.groundLambda ?? (c.groundKind ? GROUND_LAMBDA[c.groundKind] : 2),
			w: c.wallThicknessM ?? 0.3,
			z: c.depthM,
			floorR: c.floorR,
			wallR: c.wallR,
			rsiFloor: 0.17,
			rsiWall: 0.13,
			rse: 0.04
		});
		type Ref = { dt: number; dw: number; ubf: number; ubw: number; u: number; h?: number; loss?: number };
		const ref = numpyVersion
			? runReference<{ results: Ref[] }>('iso13370.py', {
					cases: [
						...heatedCases.map((c) => ({ kind: 'heated', ...common(c) })),
						...unheatedCases.map((c) => ({
							kind: 'unheated',
							...common(c),
							uf: c.floorU,
							hw: c.wallAboveGroundHeightM,
							uw: c.wallAboveGroundU,
							n: c.airChangeRate,
							volume: c.volumeM3
						}))
					]
				}).results
			: [];

		it.each(heatedCases.map((c, i) => [i, c] as const))('heated case %i agrees to 1e-12 relative', (i, c) => {
			const r = analyseHeatedBasement(c);
			const p = ref[i];
			for (const [a, b] of [
				[r.floorEquivalentThicknessM, p.dt],
				[r.wallEquivalentThicknessM, p.dw],
				[r.ubf, p.ubf],
				[r.ubw, p.ubw],
				[r.heatTransferCoefficient, p.h!],
				[r.u, p.u]
			])
				expect(rel(a, b)).toBeLessThan(1e-12);
		});

		it.each(unheatedCases.map((c, i) => [i, c] as const))(
			'unheated case %i agrees to 1e-12 relative',
			(i, c) => {
				const r = analyseUnheatedBasement(c);
				const p = ref[heatedCases.length + i];
				expect(rel(r.ubf, p.ubf)).toBeLessThan(1e-12);
				expect(rel(r.ubw, p.ubw)).toBeLessThan(1e-12);
				expect(rel(r.basementLossCoefficient, p.loss!)).toBeLessThan(1e-12);
				expect(rel(r.u, p.u)).toBeLessThan(1e-12);
			}
		);
	}
);

describe('ISO 13370 basement input validation', () => {
	it('names each bad field', () => {
		const p = parseUnheatedBasementInput({
			...unheated,
			depthM: 0,
			floorU: -1,
			airChangeRate: 'low',
			volumeM3: undefined
		});
		expect(p.ok).toBe(false);
		expect(p.ok ? {} : Object.fromEntries(p.issues.map((i) => [i.path, i.message]))).toEqual({
			depthM: 'Basement depth z must be greater than 0 m, got 0: a floor at ground level is a slab on ground',
			floorU: 'U-value Uf of the floor above the basement must be greater than 0 W/(m²·K), got -1',
			airChangeRate: 'Air change rate n must be a finite number, got the text "low"',
			volumeM3: 'Basement air volume V must be given'
		});
	});

	it('refuses a wrong floor and λ with a kind; accepts a heated basement without the unheated fields', () => {
		const h = parseHeatedBasementInput({ ...heated, perimeterM: -40, groundLambda: 20 });
		expect(h.ok ? [] : h.issues.map((i) => i.path)).toEqual(['perimeterM', 'groundLambda']);
		expect(parseHeatedBasementInput(heated).ok).toBe(true);
		expect(() => analyseHeatedBasement({ ...heated, wallR: -1 })).toThrow(
			/Basement wall resistance Rw must be 0 m²·K\/W or more/
		);
	});
});
