// An element beside an unheated space (ISO 6946:2017, 6.10.3, other unheated spaces, formula FROM
// MEMORY: Ru = Ai/(ΣAe·Ue + 0.33·n·V), n by ISO 13789's conventional air change rates, FROM MEMORY),
// Ru added to RT between the last layer and Rse, so U = 1/(1/U0 + Ru) with U0 the element as if
// exposed to outside air (common practice, from memory). The garage is that of the core's test
// (tests/physics/unheated-space.test.ts, hand calculation there); the wall's layers are chosen to
// give U0 = 0.5 W/(m²·K). ISO 13789's adjustment factor b = Hue/(Hiu + Hue) gives the same heat loss
// (algebra shown in the core's test). The wall is invented.
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput, type ElementInput } from '../../src/lib/physics';

// a wall of RT = 0.13 + 1.83 + 0.04 = 2.0 m²·K/W (Rsi horizontal 0.13, Rse 0.04, ISO 6946:2017, Table 7, from memory)
const wall = (space: Partial<NonNullable<ElementInput['unheatedSpace']>> = {}): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [{ name: 'Insulated wall', thicknessMm: 73.2, lambda: 0.04, mu: 10 }],
	unheatedSpace: {
		internalAreaM2: 20,
		externalElements: [
			{ name: 'garage walls', areaM2: 40, uValue: 1.5 },
			{ name: 'garage roof', areaM2: 20, uValue: 2.0 },
			{ name: 'garage door', areaM2: 6, uValue: 3.0 }
		],
		airtightness: 'some-open-joints',
		volumeM3: 60,
		...space
	}
});

describe('an element beside an unheated space', () => {
	it('adds Ru = Ai/(ΣAe·Ue + 0.33·n·V) to RT', () => {
		// ΣAe·Ue = 60 + 40 + 18 = 118 W/K; n = 3 h⁻¹ (some open joints); 0.33·3·60 = 59.4 W/K; Hue = 177.4 W/K
		// Ru = 20/177.4 = 0.112740 m²·K/W; U = 1/(2.0 + 0.112740) = 0.473320 W/(m²·K)
		const r = analyseElement(wall());
		const s = r.unheatedSpace!;
		expect(s.transmissionCoefficient).toBeCloseTo(118, 12);
		expect(s.airChangeRate).toBe(3);
		expect(s.airChangeSource).toMatch(/ISO 13789/);
		expect(s.ventilationCoefficient).toBeCloseTo(59.4, 12);
		expect(s.heatLossToOutside).toBeCloseTo(177.4, 12);
		expect(s.ru).toBeCloseTo(20 / 177.4, 12);
		expect(r.rTotal).toBeCloseTo(2 + 20 / 177.4, 12);
		expect(r.uValue).toBeCloseTo(0.47332, 5);
		expect(s.uExposed).toBeCloseTo(0.5, 12);
		// b = 177.4/(20·0.5 + 177.4) = 0.946638; Ai·U = b·Ai·U0
		expect(s.adjustmentFactor).toBeCloseTo(177.4 / 187.4, 12);
		expect(20 * r.uValue).toBeCloseTo(s.adjustmentFactor * 20 * s.uExposed, 10);
		expect(r.rRoofSpace).toBeUndefined();
		expect(r.notes.join(' ')).toMatch(/ISO 6946:2017, 6\.10\.3/);
	});

	it('takes a given air change rate', () => {
		// n = 0.5 h⁻¹: 0.33·0.5·60 = 9.9 W/K; Ru = 20/127.9 = 0.156372
		const r = analyseElement(wall({ airtightness: undefined, airChangeRate: 0.5 }));
		expect(r.unheatedSpace!.airChangeSource).toBe('given');
		expect(r.unheatedSpace!.ru).toBeCloseTo(20 / 127.9, 12);
		expect(r.uValue).toBeCloseTo(1 / (2 + 20 / 127.9), 10);
	});

	it('refuses a roof space with it, a space that loses no heat, and names each field', () => {
		const roof: ElementInput = { ...wall(), heatFlow: 'upward', roofSpace: 'tiles-with-felt-or-boards' };
		const p = parseElementInput(roof);
		expect(p.ok).toBe(false);
		if (!p.ok) {
			expect(p.issues.map((i) => i.path)).toEqual(['unheatedSpace']);
			expect(p.issues[0].message).toMatch(/roof space/);
		}
		const closed = parseElementInput(
			wall({ externalElements: [], airtightness: undefined, airChangeRate: 0 })
		);
		expect(closed.ok).toBe(false);
		if (!closed.ok) expect(closed.issues.map((i) => i.path)).toEqual(['unheatedSpace.externalElements']);
		const bad = parseElementInput(
			wall({
				internalAreaM2: 0,
				airChangeRate: 2,
				externalElements: [{ areaM2: -1, uValue: 20 }]
			})
		);
		expect(bad.ok).toBe(false);
		if (!bad.ok)
			expect(bad.issues.map((i) => i.path).sort()).toEqual([
				'unheatedSpace.airtightness',
				'unheatedSpace.externalElements.0.areaM2',
				'unheatedSpace.externalElements.0.uValue',
				'unheatedSpace.internalAreaM2'
			]);
	});
});
