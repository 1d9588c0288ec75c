// Unheated spaces by ISO 6946:2017 (Ru = Ai/(Σ Ae·Ue + 0.33·n·V); formula FROM MEMORY) with the
// conventional air change rates of ISO 13789 (FROM MEMORY). Checked by hand calculations shown
// beside the numbers and by an identity between the two standards: the element's heat loss Ai·U with
// U = 1/(1/Ui + Ru) equals ISO 13789's b·Hiu, b = Hue/(Hiu + Hue) (algebra: Ai/(1/Ui + Ai/Hue) =
// Hiu·Hue/(Hiu + Hue)). No published worked example is reproduced. The garage is invented.
import { describe, expect, it } from 'vitest';
import {
	analyseUnheatedSpace,
	CONVENTIONAL_AIR_CHANGE,
	parseUnheatedSpaceInput,
	type UnheatedSpaceInput
} from '../../src/lib/physics/unheated-space';
import { ROOF_SPACE_RESISTANCE } from '../../src/lib/physics/ground';

// a garage beside the house: 20 m² of wall between them; its walls, roof and door to the outside
const garage: UnheatedSpaceInput = {
	internalAreaM2: 20,
	externalElements: [
		{ name: 'garage walls', areaM2: 40, uValue: 1.5 },
		{ name: 'garage roof', areaM2: 20, uValue: 2.0 },
		{ name: 'garage door', areaM2: 6, uValue: 3.0 }
	],
	airtightness: 'some-open-joints',
	volumeM3: 60
};

describe('ISO 6946 unheated space (formula from memory)', () => {
	it('Ru = Ai/(Σ Ae·Ue + 0.33·n·V)', () => {
		// Σ Ae·Ue = 60 + 40 + 18 = 118 W/K; n = 3 h⁻¹; 0.33·3·60 = 59.4 W/K; Hue = 177.4 W/K
		// Ru = 20/177.4 = 0.112740 m²·K/W
		const r = analyseUnheatedSpace(garage);
		expect(r.transmissionCoefficient).toBeCloseTo(118, 12);
		expect(r.airChangeRate).toBe(3);
		expect(r.ventilationCoefficient).toBeCloseTo(59.4, 12);
		expect(r.ru).toBeCloseTo(20 / 177.4, 12);
		expect(r.airChangeSource).toMatch(/ISO 13789.*from memory/);
		expect(r.u).toBeUndefined();
	});

	it('with the element’s U: U = 1/(1/Ui + Ru), and Ai·U equals ISO 13789’s b·Hiu', () => {
		// Ui = 0.5: U = 1/(2 + 0.112740) = 0.473320; Hiu = 10 W/K; b = 177.4/187.4 = 0.946638
		const r = analyseUnheatedSpace({ ...garage, elementU: 0.5 });
		expect(r.u).toBeCloseTo(1 / (2 + 20 / 177.4), 12);
		expect(r.heatTransferInternal).toBe(10);
		expect(r.adjustmentFactor).toBeCloseTo(177.4 / 187.4, 12);
		expect(20 * r.u!).toBeCloseTo(r.adjustmentFactor! * r.heatTransferInternal!, 12);
		for (const [ai, ui, n, v] of [
			[5, 2.5, 0.1, 10],
			[80, 0.15, 10, 400],
			[12, 1.1, 0, 30]
		]) {
			const s = analyseUnheatedSpace({
				...garage,
				airtightness: undefined,
				internalAreaM2: ai,
				elementU: ui,
				airChangeRate: n,
				volumeM3: v
			});
			expect(ai * s.u!).toBeCloseTo(s.adjustmentFactor! * s.heatTransferInternal!, 10);
		}
	});

	it('a space open to the outside adds almost nothing: Ru → 0, U → Ui', () => {
		const r = analyseUnheatedSpace({
			...garage,
			airtightness: undefined,
			airChangeRate: 100,
			volumeM3: 1e7,
			elementU: 0.5
		});
		expect(r.ru).toBeLessThan(1e-7);
		expect(r.u).toBeCloseTo(0.5, 6);
	});

	it('conventional air change rates by airtightness (ISO 13789, from memory): 0.1, 0.5, 1, 3, 10 h⁻¹', () => {
		expect(CONVENTIONAL_AIR_CHANGE).toEqual({
			'no-openings-well-sealed': 0.1,
			'well-sealed': 0.5,
			'well-sealed-small-openings': 1,
			'some-open-joints': 3,
			'many-open-joints': 10
		});
	});

	it('refers roof spaces to the existing table rather than repeating it; carries the cautions', () => {
		const r = analyseUnheatedSpace(garage);
		expect(Object.keys(ROOF_SPACE_RESISTANCE)).toHaveLength(4);
		expect(r.cautions.some((c) => c.includes('roof space'))).toBe(true);
		expect(r.cautions.some((c) => c.includes('professional judgement'))).toBe(true);
		expect(r.method[0]).toMatch(/ISO 6946:2017/);
	});
});

describe('ISO 6946 unheated space input validation', () => {
	const issues = (raw: unknown) => {
		const p = parseUnheatedSpaceInput(raw);
		return p.ok ? {} : Object.fromEntries(p.issues.map((i) => [i.path, i.message]));
	};

	it('names each bad field', () => {
		expect(
			issues({
				...garage,
				internalAreaM2: 0,
				externalElements: [{ name: 'garage walls', areaM2: -40, uValue: 1.5 }],
				airChangeRate: 2
			})
		).toEqual({
			internalAreaM2: 'Area Ai between the heated and the unheated space must be greater than 0 m², got 0',
			'externalElements.0.areaM2':
				'External element 1 (“garage walls”): area Ae must be 0 m² or more, got -40',
			airtightness:
				'Airtightness must not be given with airChangeRate: give the rate or the airtightness, not both'
		});
		expect(issues({ ...garage, airtightness: undefined })).toEqual({
			airChangeRate: 'Air change rate n must be given (h⁻¹), or the airtightness for the conventional value'
		});
	});

	it('refuses a space that loses no heat to the outside', () => {
		expect(Object.keys(issues({ ...garage, externalElements: [], volumeM3: 0 }))).toEqual([
			'externalElements'
		]);
		expect(() =>
			analyseUnheatedSpace({ ...garage, externalElements: [], airtightness: undefined, airChangeRate: 0 })
		).toThrow(/lose no heat to the outside/);
	});
});
