// Suspended floors by ISO 13370:2017, 8.2 (formulas and the wind shielding factors quoted FROM
// MEMORY). Checked against an independent Python/numpy implementation of the same formulas
// (tests/physics/reference/iso13370.py, written from the formulas, not from the engine's code: it
// catches slips of coding, not a formula misremembered), hand calculations shown beside the numbers,
// and limits of the formulas. No published worked example is reproduced. The floors are invented.
import { describe, expect, it } from 'vitest';
import {
	analyseSuspendedFloor,
	parseSuspendedFloorInput,
	WIND_SHIELDING_FACTOR,
	type SuspendedFloorInput
} from '../../src/lib/physics/ground-suspended';
import { GROUND_LAMBDA } from '../../src/lib/physics/ground';
import { numpyVersion, referenceTitle, runReference } from './reference/python';

const floor: SuspendedFloorInput = {
	perimeterM: 40,
	areaM2: 100,
	floorU: 1.5,
	heightM: 0.3,
	underfloorWallU: 1.7,
	openingsPerPerimeter: 0.003,
	windSpeed: 5,
	windShielding: 'average'
};

const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('ISO 13370 suspended floor: hand calculation and limits (formulas from memory)', () => {
	it('U = 1/(1/Uf + 1/(Ug + Ux)) for a 100 m² floor with 40 m of exposed perimeter', () => {
		// B′ = 100/20 = 5 m; dg = 0.3 + 2·(0.17 + 0 + 0.04) = 0.72 m
		// Ug = 4/(5π + 0.72)·ln(5π/0.72 + 1) = 0.243494·3.127386 = 0.761504
		// Ux = 2·0.3·1.7/5 + 1450·0.003·5·0.05/5 = 0.204 + 0.2175 = 0.4215
		// U = 1/(1/1.5 + 1/1.183004) = 0.661388
		const r = analyseSuspendedFloor(floor);
		expect(r.characteristicDimensionM).toBe(5);
		expect(r.equivalentThicknessM).toBeCloseTo(0.72, 12);
		expect(r.ug).toBeCloseTo(0.761504, 6);
		expect(r.uxWalls).toBeCloseTo(0.204, 12);
		expect(r.uxVentilation).toBeCloseTo(0.2175, 12);
		expect(r.u).toBeCloseTo(0.661388, 6);
		expect(r.windShieldingFactor).toBe(0.05);
	});

	it('wind shielding factors: sheltered 0.02, average 0.05, exposed 0.10 (ISO 13370:2017, from memory)', () => {
		expect(WIND_SHIELDING_FACTOR).toEqual({ sheltered: 0.02, average: 0.05, exposed: 0.1 });
		const exposed = analyseSuspendedFloor({ ...floor, windShielding: undefined, windShieldingFactor: 0.1 });
		expect(exposed.uxVentilation).toBeCloseTo(0.435, 12); // 1450·0.003·5·0.1/5
	});

	it('no ventilation openings: the ventilation part of Ux is zero and no shielding is needed', () => {
		const r = analyseSuspendedFloor({ ...floor, openingsPerPerimeter: 0, windShielding: undefined });
		expect(r.uxVentilation).toBe(0);
		expect(r.ux).toBeCloseTo(0.204, 12);
		// nor wind
		expect(analyseSuspendedFloor({ ...floor, windSpeed: 0 }).uxVentilation).toBe(0);
		// with no walls above the ground either, Ux = 0 and U is Uf and Ug in series
		const closed = analyseSuspendedFloor({
			...floor,
			openingsPerPerimeter: 0,
			heightM: 0,
			windShielding: undefined
		});
		expect(closed.ux).toBe(0);
		expect(closed.u).toBeCloseTo(1 / (1 / 1.5 + 1 / closed.ug), 14);
	});

	it('a large floor: Ug tends to (2λ/(π·B′))·ln(π·B′/dg) and Ux to zero', () => {
		// B′ = 1 000 000/(0.5·200) = 10 000 m; the relative gap is of order dg/(π·B′)
		const r = analyseSuspendedFloor({ ...floor, areaM2: 1e6, perimeterM: 200 });
		const b = 10000;
		expect(rel(r.ug, ((2 * 2) / (Math.PI * b)) * Math.log((Math.PI * b) / 0.72))).toBeLessThan(1e-4);
		expect(r.ux).toBeCloseTo(0.4215 * (5 / b), 12);
	});

	it('insulation on the ground under the void adds λ·Rg to dg; a soil kind gives its λ', () => {
		const r = analyseSuspendedFloor({ ...floor, groundInsulationR: 1, groundKind: 'clay-or-silt' });
		expect(r.groundLambda).toBe(GROUND_LAMBDA['clay-or-silt']);
		expect(r.equivalentThicknessM).toBeCloseTo(0.3 + 1.5 * (0.17 + 1 + 0.04), 12);
		expect(r.groundLambdaSource).toMatch(/clay or silt/);
		expect(r.cautions.some((c) => c.includes('professional judgement'))).toBe(true);
		expect(r.method[0]).toMatch(/ISO 13370:2017, 8\.2/);
	});
});

describe.skipIf(!numpyVersion)(
	`ISO 13370 suspended floor against the Python/numpy reference (${referenceTitle})`,
	() => {
		const cases: SuspendedFloorInput[] = [
			floor,
			{
				...floor,
				areaM2: 60,
				perimeterM: 32,
				groundLambda: 1.5,
				wallThicknessM: 0.4,
				windShielding: 'exposed'
			},
			{ ...floor, openingsPerPerimeter: 0, windShielding: undefined, heightM: 0.6 },
			{
				...floor,
				groundKind: 'homogeneous-rock',
				groundInsulationR: 2,
				floorU: 0.25,
				windShielding: undefined,
				windShieldingFactor: 0.02
			},
			{ ...floor, areaM2: 12, perimeterM: 14, windSpeed: 12, openingsPerPerimeter: 0.01 }
		];
		const lambdaOf = (c: SuspendedFloorInput) =>
			c.groundLambda ?? (c.groundKind ? GROUND_LAMBDA[c.groundKind] : 2);
		const ref = numpyVersion
			? runReference<{ results: { b: number; dg: number; ug: number; ux: number; u: number }[] }>(
					'iso13370.py',
					{
						cases: cases.map((c) => ({
							kind: 'suspended',
							areaM2: c.areaM2,
							perimeterM: c.perimeterM,
							lambda: lambdaOf(c),
							w: c.wallThicknessM ?? 0.3,
							rsi: 0.17,
							rse: 0.04,
							rg: c.groundInsulationR ?? 0,
							h: c.heightM,
							uw: c.underfloorWallU,
							eps: c.openingsPerPerimeter,
							v: c.windSpeed,
							fw: c.windShieldingFactor ?? (c.windShielding ? WIND_SHIELDING_FACTOR[c.windShielding] : 0),
							uf: c.floorU
						}))
					}
				).results
			: [];

		it.each(cases.map((c, i) => [i, c] as const))('case %i agrees to 1e-12 relative', (i, c) => {
			const r = analyseSuspendedFloor(c);
			const p = ref[i];
			expect(rel(r.equivalentThicknessM, p.dg)).toBeLessThan(1e-12);
			expect(rel(r.ug, p.ug)).toBeLessThan(1e-12);
			expect(r.ux === 0 ? p.ux : rel(r.ux, p.ux)).toBeLessThan(1e-12);
			expect(rel(r.u, p.u)).toBeLessThan(1e-12);
		});
	}
);

describe('ISO 13370 suspended floor input validation', () => {
	it('names each bad field', () => {
		const p = parseSuspendedFloorInput({
			...floor,
			groundKind: 'peat',
			floorU: 0,
			heightM: -1,
			windShielding: undefined,
			openingsPerPerimeter: 0.003
		});
		expect(p.ok).toBe(false);
		const messages = p.ok ? {} : Object.fromEntries(p.issues.map((i) => [i.path, i.message]));
		expect(messages).toEqual({
			groundKind:
				'Kind of ground must be one of "clay-or-silt", "sand-or-gravel", "homogeneous-rock", got the text "peat"',
			floorU: 'Floor deck U-value Uf must be greater than 0 W/(m²·K), got 0',
			heightM: 'Floor height above the ground h must be 0 m or more, got -1',
			windShielding:
				'Wind shielding must be given (sheltered, average or exposed), or windShieldingFactor, for the ventilation term'
		});
	});

	it('refuses λ with a kind of ground, both shieldings, a B′ beyond its bound, missing fields', () => {
		const paths = (raw: unknown) => {
			const p = parseSuspendedFloorInput(raw);
			return p.ok ? [] : p.issues.map((i) => i.path);
		};
		expect(paths({ ...floor, groundLambda: 1.5, groundKind: 'clay-or-silt' })).toEqual(['groundKind']);
		expect(paths({ ...floor, windShieldingFactor: 0.05 })).toEqual(['windShieldingFactor']);
		expect(paths({ ...floor, perimeterM: 0.01, areaM2: 100 })).toEqual(['perimeterM']); // B′ = 20 000 m
		expect(paths({ perimeterM: 40, areaM2: 100 })).toEqual([
			'floorU',
			'heightM',
			'underfloorWallU',
			'openingsPerPerimeter',
			'windSpeed'
		]);
		expect(() => analyseSuspendedFloor({ ...floor, windSpeed: 'fast' })).toThrow(
			/Wind speed v must be a finite number/
		);
	});
});
