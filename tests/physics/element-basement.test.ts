// Basements and edge insulation as ground-floor elements (ISO 13370:2017, 8.3, 8.4 and the edge
// insulation of a slab on ground; numbering and formulas FROM MEMORY). The element's layers give the
// floor's Rf = RT − Rsi − Rse (Rsi 0.17 downward, Rse 0.04 m²·K/W, ISO 6946:2017, Table 7, from
// memory), and the floor above an unheated basement takes Rsi on both faces. The cases are those of
// the cores' own tests (tests/physics/ground-basement.test.ts and ground-edge.test.ts, whose numbers
// are hand calculations checked there against the independent numpy reference
// tests/physics/reference/iso13370.py); the layers are chosen to give the same Rf, so the element must
// give the same U. Hand calculations are shown beside the numbers. The floors are invented.
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput, type ElementInput } from '../../src/lib/physics';

const ground = { perimeterM: 40, areaM2: 100 };

/** A floor of one layer of resistance d/λ, m²·K/W. */
const floorOf = (r: number, extra: Partial<NonNullable<ElementInput['ground']>>): ElementInput => ({
	heatFlow: 'downward',
	layers: [{ name: 'Floor insulation', thicknessMm: r * 40, lambda: 0.04, mu: 50 }],
	ground: { ...ground, ...extra } as ElementInput['ground']
});

describe('a heated basement element (ISO 13370:2017, 8.3)', () => {
	it('gives U′ = H/(A + z·P) over the floor and the walls in the ground', () => {
		// layers: 20 mm at λ 0.04 → Rf = 0.5 m²·K/W; z 2.5 m, Rw 1.5 m²·K/W, λ 2.0, w 0.3 m
		// dt = 0.3 + 2·(0.17 + 0.5 + 0.04) = 1.72 m; dw = 2·(0.13 + 1.5 + 0.04) = 3.34 m
		// Ubf = 0.393786, Ubw = 0.342568 W/(m²·K); H = 73.6354 W/K; U′ = 73.6354/200 = 0.368177
		// (ground-basement.test.ts, 'Ubf, Ubw, H and U′ of a 2.5 m deep basement')
		const r = analyseElement(floorOf(0.5, { basement: { kind: 'heated', depthM: 2.5, wallR: 1.5 } }));
		const b = r.ground!.basement!;
		expect(r.ground!.method).toBe('ISO 13370:2017, 8.3 (heated basement)');
		expect(b.floorR).toBeCloseTo(0.5, 12);
		expect(b.floorEquivalentThicknessM).toBeCloseTo(1.72, 12);
		expect(b.wallEquivalentThicknessM).toBeCloseTo(3.34, 12);
		expect(b.ubf).toBeCloseTo(0.393786, 6);
		expect(b.ubw).toBeCloseTo(0.342568, 6);
		expect(b.heatTransferCoefficient).toBeCloseTo(73.6354, 3);
		expect(b.areaInGroundM2).toBe(200);
		expect(r.uValue).toBeCloseTo(0.368177, 6);
		expect(r.uValueRounded).toBe(0.37);
		expect(r.rTotal).toBeCloseTo(1 / r.uValue, 12);
		expect(r.notes.join(' ')).toMatch(/A \+ z·P = 200 m²/);
	});
});

describe('a floor over an unheated basement (ISO 13370:2017, 8.4)', () => {
	it('takes Uf with Rsi on both faces and 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V)', () => {
		// layers: 66.4 mm at λ 0.04 → Rf = 1.66; Uf = 1/(0.17 + 1.66 + 0.17) = 0.5 W/(m²·K)
		// basement: floor Rf 0, walls Rw 0.2, z 2.5 m, h 0.5 m, Uw 1.5, n 0.3 h⁻¹, V 250 m³
		// Ubf = 0.496502, Ubw = 0.836148; loss = 188.0150 W/K; U = 1/(2 + 100/188.015) = 0.394965
		// (ground-basement.test.ts, '1/U = 1/Uf + A/(…)')
		const r = analyseElement(
			floorOf(1.66, {
				basement: {
					kind: 'unheated',
					depthM: 2.5,
					wallR: 0.2,
					floorR: 0,
					wallAboveGroundHeightM: 0.5,
					wallAboveGroundU: 1.5,
					airChangeRate: 0.3,
					volumeM3: 250
				}
			})
		);
		const b = r.ground!.basement!;
		expect(r.ground!.method).toBe('ISO 13370:2017, 8.4 (unheated basement)');
		expect(b.floorU).toBeCloseTo(0.5, 12);
		expect(b.ubf).toBeCloseTo(0.496502, 6);
		expect(b.ubw).toBeCloseTo(0.836148, 6);
		expect(b.ventilationCoefficient).toBeCloseTo(24.75, 12);
		expect(b.basementLossCoefficient).toBeCloseTo(188.015, 3);
		expect(r.uValue).toBeCloseTo(0.394965, 6);
		expect(r.ground!.rGround).toBeCloseTo(1 / r.uValue - r.rBuildUp!, 12);
	});

	it('names each missing or out-of-range basement field', () => {
		const p = parseElementInput(floorOf(1, { basement: { kind: 'unheated', depthM: 0, wallR: 60 } }));
		expect(p.ok).toBe(false);
		if (p.ok) return;
		expect(p.issues.map((i) => i.path).sort()).toEqual([
			'ground.basement.airChangeRate',
			'ground.basement.depthM',
			'ground.basement.floorR',
			'ground.basement.volumeM3',
			'ground.basement.wallAboveGroundHeightM',
			'ground.basement.wallAboveGroundU',
			'ground.basement.wallR'
		]);
		expect(p.issues.find((i) => i.path === 'ground.basement.depthM')!.message).toMatch(/slab on the ground/);
	});
});

describe('a slab on the ground with edge insulation (ISO 13370:2017, U = U0 + 2·Δψ/B′)', () => {
	const edge = { orientation: 'horizontal' as const, widthM: 1, insulationThicknessM: 0.05 };
	it('gives Δψ and U from Rn given, or from dn/λn', () => {
		// layers: 4 mm at λ 0.04 → Rf = 0.1; dt = 0.3 + 2·(0.17 + 0.1 + 0.04) = 0.92 m, U0 = 0.696289
		// Rn = 2, dn 0.05 m: R′ = 1.975, d′ = 3.95 m; Δψ = −0.349470 W/(m·K); U = 0.556501
		// (ground-edge.test.ts, 'horizontal edge insulation 1 m wide, Rn 2 m²·K/W, 50 mm thick')
		const byR = analyseElement(floorOf(0.1, { edge: { ...edge, insulationR: 2 } }));
		const e = byR.ground!.edge!;
		expect(byR.ground!.method).toBe('ISO 13370:2017, 8.1 with edge insulation');
		expect(e.u0).toBeCloseTo(0.6962891, 6);
		expect(e.additionalResistance).toBeCloseTo(1.975, 12);
		expect(e.additionalThicknessM).toBeCloseTo(3.95, 12);
		expect(e.deltaPsi).toBeCloseTo(-0.34947, 5);
		expect(byR.uValue).toBeCloseTo(0.556501, 5);
		// λn 0.025 W/(m·K) over 50 mm is the same Rn = 0.05/0.025 = 2
		const byLambda = analyseElement(floorOf(0.1, { edge: { ...edge, insulationLambda: 0.025 } }));
		expect(byLambda.ground!.edge!.insulationR).toBeCloseTo(2, 12);
		expect(byLambda.uValue).toBeCloseTo(byR.uValue, 12);
	});

	it('refuses Rn below dn/λ of the ground, both Rn and λn, and edge insulation with a basement', () => {
		// dn/λ = 0.05/2 = 0.025 m²·K/W
		const low = parseElementInput(floorOf(0.1, { edge: { ...edge, insulationR: 0.01 } }));
		expect(low.ok).toBe(false);
		if (!low.ok) {
			expect(low.issues.map((i) => i.path)).toEqual(['ground.edge.insulationR']);
			expect(low.issues[0].message).toMatch(/dn\/λ = 0\.025/);
		}
		const both = parseElementInput(
			floorOf(0.1, { edge: { ...edge, insulationR: 2, insulationLambda: 0.025 } })
		);
		expect(both.ok).toBe(false);
		if (!both.ok) expect(both.issues.map((i) => i.path)).toEqual(['ground.edge.insulationLambda']);
		const mixed = parseElementInput(
			floorOf(0.1, { edge: { ...edge, insulationR: 2 }, basement: { kind: 'heated', depthM: 2, wallR: 1 } })
		);
		expect(mixed.ok).toBe(false);
		if (!mixed.ok) expect(mixed.issues.map((i) => i.path)).toEqual(['ground.edge']);
	});
});

describe('what the ISO 13370 modules would refuse is refused by the element’s own check', () => {
	it('a floor over an unheated basement with Uf over 10 W/(m²·K), and Rf over 50 m²·K/W', () => {
		const basement = {
			kind: 'unheated' as const,
			depthM: 2,
			wallR: 0.2,
			floorR: 0,
			wallAboveGroundHeightM: 0.5,
			wallAboveGroundU: 1.5,
			airChangeRate: 0.3,
			volumeM3: 200
		};
		// Rsi 0.01 given: Uf = 1/(0.01 + 0.04 + 0.01) = 16.7 W/(m²·K)
		const thin = parseElementInput({ ...floorOf(0.04, { basement }), rsi: 0.01 });
		expect(thin.ok).toBe(false);
		if (!thin.ok) expect(thin.issues.map((i) => i.path)).toEqual(['layers']);
		const thick = parseElementInput({
			...floorOf(1, {
				edge: { orientation: 'vertical', widthM: 0.5, insulationThicknessM: 0.05, insulationR: 1 }
			}),
			layers: [{ name: 'Foam glass', thicknessMm: 600, lambda: 0.01, mu: 50 }]
		});
		expect(thick.ok).toBe(false);
		if (!thick.ok) expect(thick.issues.map((i) => i.path)).toContain('layers');
	});
});
