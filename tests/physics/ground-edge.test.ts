// Slab on ground with edge insulation by ISO 13370:2017 (U = U0 + 2·Δψ/B′; formulas quoted FROM
// MEMORY). Checked against an independent Python/numpy implementation of the same formulas
// (tests/physics/reference/iso13370.py, written from the formulas, not from the engine's code),
// hand calculations shown beside the numbers, and limits of the formulas: no width or no added
// resistance changes nothing; an endless strip tends to −(λ/π)·ln(1 + d′/dt). No published worked
// example is reproduced. The floors are invented.
import { describe, expect, it } from 'vitest';
import {
	analyseEdgeInsulatedFloor,
	edgeInsulationPsi,
	parseEdgeInsulatedFloorInput,
	type EdgeInsulatedFloorInput
} from '../../src/lib/physics/ground-edge';
import { GROUND_LAMBDA, slabOnGroundU } from '../../src/lib/physics/ground';
import { numpyVersion, referenceTitle, runReference } from './reference/python';

const floor: EdgeInsulatedFloorInput = {
	perimeterM: 40,
	areaM2: 100,
	floorR: 0.1,
	edge: { orientation: 'horizontal', widthM: 1, insulationR: 2, insulationThicknessM: 0.05 }
};
const rel = (a: number, b: number) => Math.abs(a - b) / Math.abs(b);

describe('ISO 13370 edge insulation: hand calculation and limits (formulas from memory)', () => {
	it('horizontal edge insulation 1 m wide, Rn 2 m²·K/W, 50 mm thick', () => {
		// U0: dt = 0.3 + 2·(0.17 + 0.1 + 0.04) = 0.92 m < B′ = 5 m, U0 = 0.696289 (as tests/physics/ground.test.ts)
		// R′ = 2 − 0.05/2 = 1.975, d′ = 3.95 m
		// Δψ = −(2/π)·[ln(1/0.92 + 1) − ln(1/4.87 + 1)] = −0.636620·(0.735707 − 0.186761) = −0.349470
		// U = 0.696289 + 2·(−0.349470)/5 = 0.556501
		const r = analyseEdgeInsulatedFloor(floor);
		expect(r.u0).toBeCloseTo(0.6962891, 6);
		expect(r.additionalResistance).toBeCloseTo(1.975, 12);
		expect(r.additionalThicknessM).toBeCloseTo(3.95, 12);
		expect(r.deltaPsi).toBeCloseTo(-0.34947, 5);
		expect(r.u).toBeCloseTo(0.556501, 5);
	});

	it('no width, or no resistance beyond the ground’s, changes nothing: U = U0 of the slab on ground', () => {
		const slab = slabOnGroundU({ perimeterM: 40, areaM2: 100 }, 0.17, 0.1, 0.04);
		const none = analyseEdgeInsulatedFloor({ ...floor, edge: { ...floor.edge, widthM: 0 } });
		expect(none.deltaPsi === 0).toBe(true); // −0 is allowed
		expect(none.u).toBe(slab.u);
		const likeGround = analyseEdgeInsulatedFloor({
			...floor,
			edge: { ...floor.edge, insulationR: 0.05 / 2 }
		});
		expect(likeGround.additionalResistance).toBe(0);
		expect(likeGround.u).toBe(slab.u);
	});

	it('an endless strip: Δψ tends to −(λ/π)·ln(1 + d′/dt), horizontal and vertical alike', () => {
		// ln(D/dt + 1) − ln(D/(dt + d′) + 1) → ln((dt + d′)/dt) as D → ∞
		const limit = -(2 / Math.PI) * Math.log(1 + 3.95 / 0.92);
		expect(rel(edgeInsulationPsi('horizontal', 2, 0.92, 3.95, 1e9), limit)).toBeLessThan(1e-8);
		expect(rel(edgeInsulationPsi('vertical', 2, 0.92, 3.95, 1e9), limit)).toBeLessThan(1e-8);
	});

	it('vertical insulation of depth D acts as horizontal insulation of width 2D', () => {
		// the vertical formula is the horizontal one with 2D in place of D
		const v = analyseEdgeInsulatedFloor({
			...floor,
			edge: { ...floor.edge, orientation: 'vertical', widthM: 0.6 }
		});
		expect(v.deltaPsi).toBe(edgeInsulationPsi('horizontal', 2, v.equivalentThicknessM, 3.95, 1.2));
		// and deeper or wider insulation always helps more
		const wide = analyseEdgeInsulatedFloor({ ...floor, edge: { ...floor.edge, widthM: 1.5 } });
		expect(wide.u).toBeLessThan(analyseEdgeInsulatedFloor(floor).u);
	});

	it('carries the method, a λ note, the cautions', () => {
		const r = analyseEdgeInsulatedFloor({ ...floor, groundKind: 'clay-or-silt' });
		expect(r.groundLambda).toBe(GROUND_LAMBDA['clay-or-silt']);
		expect(r.method.join(' ')).toContain('U = U0 + 2·Δψ/B′');
		expect(r.notes[0]).toMatch(/clay or silt/);
		expect(r.cautions.some((c) => c.includes('professional judgement'))).toBe(true);
	});
});

describe.skipIf(!numpyVersion)(
	`ISO 13370 edge insulation against the Python/numpy reference (${referenceTitle})`,
	() => {
		const cases: EdgeInsulatedFloorInput[] = [
			floor,
			{ ...floor, edge: { ...floor.edge, orientation: 'vertical', widthM: 0.8 } },
			{ ...floor, areaM2: 60, perimeterM: 32, groundLambda: 1.5, wallThicknessM: 0.4, floorR: 1.5 },
			{
				...floor,
				groundKind: 'homogeneous-rock',
				floorR: 4,
				edge: { orientation: 'horizontal', widthM: 2, insulationR: 4, insulationThicknessM: 0.12 }
			},
			{
				...floor,
				areaM2: 400,
				perimeterM: 80,
				edge: { orientation: 'vertical', widthM: 1.5, insulationR: 1, insulationThicknessM: 0.03 }
			}
		];
		const ref = numpyVersion
			? runReference<{ results: { dt: number; u0: number; dPrime: number; psi: number; u: number }[] }>(
					'iso13370.py',
					{
						cases: cases.map((c) => ({
							kind: 'edge',
							areaM2: c.areaM2,
							perimeterM: c.perimeterM,
							lambda: c.groundLambda ?? (c.groundKind ? GROUND_LAMBDA[c.groundKind] : 2),
							w: c.wallThicknessM ?? 0.3,
							rsi: 0.17,
							rse: 0.04,
							floorR: c.floorR,
							orientation: c.edge.orientation,
							D: c.edge.widthM,
							rn: c.edge.insulationR,
							dn: c.edge.insulationThicknessM
						}))
					}
				).results
			: [];

		it.each(cases.map((c, i) => [i, c] as const))('case %i agrees to 1e-12 relative', (i, c) => {
			const r = analyseEdgeInsulatedFloor(c);
			const p = ref[i];
			expect(rel(r.equivalentThicknessM, p.dt)).toBeLessThan(1e-12);
			expect(rel(r.u0, p.u0)).toBeLessThan(1e-12);
			expect(rel(r.additionalThicknessM, p.dPrime)).toBeLessThan(1e-12);
			expect(rel(r.deltaPsi, p.psi)).toBeLessThan(1e-12);
			expect(rel(r.u, p.u)).toBeLessThan(1e-12);
		});
	}
);

describe('ISO 13370 edge insulation input validation', () => {
	const issues = (raw: unknown) => {
		const p = parseEdgeInsulatedFloorInput(raw);
		return p.ok ? {} : Object.fromEntries(p.issues.map((i) => [i.path, i.message]));
	};

	it('names each bad field of the edge', () => {
		expect(
			issues({
				...floor,
				edge: { orientation: 'diagonal', widthM: -1, insulationR: 2, insulationThicknessM: 0.05 }
			})
		).toEqual({
			'edge.orientation':
				'Edge insulation orientation must be one of "horizontal", "vertical", got the text "diagonal"',
			'edge.widthM': 'Edge insulation width or depth D must be 0 m or more, got -1'
		});
		expect(issues({ ...floor, edge: undefined })).toEqual({
			edge: 'Edge insulation must be an object with orientation, widthM, insulationR and insulationThicknessM'
		});
	});

	it('refuses insulation that resists less than the ground it replaces, and a U of zero or less', () => {
		expect(issues({ ...floor, edge: { ...floor.edge, insulationR: 0.01 } })).toEqual({
			'edge.insulationR':
				'Edge insulation resistance Rn must be at least dn/λ = 0.025 m²·K/W, the resistance of the ground it replaces (R′ = Rn − dn/λ would be negative)'
		});
		// a 4 m² floor (B′ = 1 m) with 10 m of Rn 50: U0 = 1.74, Δψ = −1.66, U0 + 2Δψ/B′ < 0: outside the method
		const tiny = {
			perimeterM: 8,
			areaM2: 4,
			floorR: 0,
			edge: { orientation: 'horizontal', widthM: 10, insulationR: 50, insulationThicknessM: 0 }
		};
		expect(Object.keys(issues(tiny))).toEqual(['edge']);
		expect(() => analyseEdgeInsulatedFloor(tiny)).toThrow(/outside the range of the method/);
	});
});
