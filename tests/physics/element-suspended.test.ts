// A suspended floor as an element (ISO 13370:2017, 8.2, formulas and the shielding factor from memory):
// the layers are the floor deck, whose Uf takes the internal surface resistance of a floor (0.17 m²·K/W,
// ISO 6946:2017, Table 7, from memory) on both faces, and the element's U is the suspended floor's
// U = 1/(1/Uf + 1/(Ug + Ux)). Checked by a hand calculation shown beside the numbers, and the module of
// the suspended floor itself is checked against the numpy reference in ground-suspended.test.ts. The
// floor is invented (timber boards on joists over a ventilated void, a common older dwelling's floor).
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput, type ElementInput } from '../../src/lib/physics';

const floor = (): ElementInput => ({
	heatFlow: 'downward',
	layers: [
		{ name: 'Timber boards', thicknessMm: 22, lambda: 0.13, mu: 50 },
		{ name: 'Mineral wool between joists', thicknessMm: 100, lambda: 0.04, mu: 1 }
	],
	ground: {
		perimeterM: 40,
		areaM2: 100,
		suspended: {
			heightM: 0.3,
			underfloorWallU: 1.7,
			openingsPerPerimeter: 0.003,
			windSpeed: 5,
			windShielding: 'average'
		}
	}
});

describe('a suspended floor element', () => {
	it('gives the suspended floor U from the deck with Rsi on both faces', () => {
		// deck: Rf = 0.022/0.13 + 0.1/0.04 = 0.169231 + 2.5 = 2.669231 m²·K/W
		// Uf = 1/(0.17 + 2.669231 + 0.17) = 1/3.009231 = 0.332311 W/(m²·K)
		// B′ = 5 m, dg = 0.3 + 2·(0.17 + 0.04) = 0.72 m, Ug = 0.761504 (as in ground-suspended.test.ts)
		// Ux = 2·0.3·1.7/5 + 1450·0.003·5·0.05/5 = 0.204 + 0.2175 = 0.4215
		// U = 1/(1/0.332311 + 1/(0.761504 + 0.4215)) = 1/(3.0092308 + 0.8453056) = 0.2594346
		const r = analyseElement(floor());
		const s = r.ground!.suspended!;
		expect(r.ground!.method).toBe('ISO 13370:2017, 8.2 (suspended floor)');
		expect(s.floorU).toBeCloseTo(0.332311, 6);
		expect(s.ug).toBeCloseTo(0.761504, 6);
		expect(s.ux).toBeCloseTo(0.4215, 12);
		expect(r.uValue).toBeCloseTo(0.2594346, 6);
		expect(r.uValueRounded).toBe(0.26);
		// the floor is carried as 1/U; the underfloor space and the ground below the deck
		expect(r.rTotal).toBeCloseTo(1 / r.uValue, 12);
		expect(r.ground!.rGround).toBeCloseTo(1 / r.uValue - r.rBuildUp!, 12);
		expect(r.notes.join(' ')).toMatch(/Uf = 1\/\(Rsi \+ Rf \+ Rsi\)/);
	});

	it('refuses values out of range and an unknown shielding, naming the field', () => {
		const bad = floor() as unknown as { ground: { suspended: Record<string, unknown> } };
		bad.ground.suspended.heightM = 12;
		bad.ground.suspended.windShielding = 'windy';
		const p = parseElementInput(bad);
		expect(p.ok).toBe(false);
		if (p.ok) return;
		expect(p.issues.map((i) => i.path).sort()).toEqual([
			'ground.suspended.heightM',
			'ground.suspended.windShielding'
		]);
	});
});
