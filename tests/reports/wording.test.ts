// The figures and sentences the result panel and the PDF share (src/lib/reports/wording.ts).
// Sources of the expected numbers:
//   - Rsi 0.13 / 0.17 and Rse 0.04 m²·K/W, ISO 6946:2017 Table 7; R = d/λ and RT = Rsi + ΣR + Rse,
//     ISO 6946:2017 6.7.1 (from memory); the combined method's upper and lower limits R′T and R″T,
//     ISO 6946:2017 6.7.2 (from memory); U = q/(θi − θe), the definition of the thermal transmittance
//     (ISO 6946:2017 clause 3, from memory), so the element's mean flux is q = U·(θi − θe);
//   - the ground floor is carried without a Glaser check: ISO 13788:2012 clause 6 (from memory) works with
//     the external air on the outer face, which a slab on the ground does not have;
//   - the 1 % threshold of the mass-balance caution is this product's (common practice, no source).
// Build-ups and climates are constructed inputs, not real sites or products.
import { describe, expect, it } from 'vitest';
import { analyseElement, type ElementInput, type ElementResult } from '../../src/lib/physics';
import {
	CREATED_CAUTION_FRACTION,
	clearFieldHeatFlux,
	condensationNotAssessed,
	elementHeatFlux,
	massBalanceCaution,
	surfaceNotAssessed
} from '../../src/lib/reports/wording';

const DESIGN = { internal: 20, external: -5 };

/** 15 mm plaster λ 0.57, 100 mm block λ 1.13, 100 mm wool λ 0.035, 102.5 mm brick λ 0.77 (illustrative). */
const cavityWall: ElementInput = {
	heatFlow: 'horizontal',
	designTemperatures: DESIGN,
	layers: [
		{ name: 'Gypsum plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
		{ name: 'Dense concrete block', thicknessMm: 100, lambda: 1.13, mu: 15 },
		{ name: 'Mineral wool full fill', thicknessMm: 100, lambda: 0.035, mu: 1 },
		{ name: 'Brick outer leaf', thicknessMm: 102.5, lambda: 0.77, mu: 10 }
	]
};

/** A timber-frame wall, studs 38 mm at 600 mm centres, a vapour-tight sheathing outside (illustrative). */
const timberWall: ElementInput = {
	heatFlow: 'horizontal',
	designTemperatures: DESIGN,
	layers: [
		{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25, mu: 10 },
		{
			name: 'Mineral wool between studs',
			thicknessMm: 140,
			lambda: 0.04,
			mu: 1,
			bridge: { lambda: 0.13, fraction: 38 / 600 }
		},
		{ name: 'Vapour-tight sheathing', thicknessMm: 10, lambda: 0.2, sd: 50 },
		{ name: 'Render on board', thicknessMm: 20, lambda: 0.5, mu: 20 }
	]
};

/** A cold winter (invented), so that condensation forms behind the insulation of the timber wall. */
const COLD = [-8, -6, -1, 6, 12, 16, 18, 17, 12, 6, 0, -5].map((temperature, i) => ({
	month: i + 1,
	temperature,
	relativeHumidity: [88, 86, 80, 72, 68, 68, 70, 73, 78, 83, 87, 89][i]
}));

/** A 150 mm slab, λ 1.5, on the ground: A 100 m², exposed perimeter 40 m (ISO 13370:2017, 8.1). */
const groundFloor = (withClimate: boolean): ElementInput => ({
	heatFlow: 'downward',
	designTemperatures: DESIGN,
	ground: { perimeterM: 40, areaM2: 100 },
	layers: [{ name: 'Concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 }],
	...(withClimate ? { internal: { temperature: 20, relativeHumidity: 50 }, climate: COLD } : {})
});

describe('heat flux at the design temperatures: one figure, q = U·(θi − θe)', () => {
	it('is U·Δθ for a wall of plain layers, by hand', () => {
		const r = analyseElement(cavityWall);
		// RT = 0.13 + 0.015/0.57 + 0.100/1.13 + 0.100/0.035 + 0.1025/0.77 + 0.04 = 3.2751 m²·K/W,
		// U = 0.30534 W/(m²·K); q = 0.30534 · (20 − (−5)) = 7.633 W/m².
		const hf = elementHeatFlux(r);
		expect(r.uValue).toBeCloseTo(1 / 3.2751, 4);
		expect(hf.q).toBeCloseTo(7.633, 2);
		expect(hf.value).toBe('7.63 W/m²');
		expect(hf.label).toBe('Heat flux q = U·(θi − θe)');
		expect(hf.definition).toContain('the mean heat flux through the element at the design temperatures');
		expect(hf.definition).toContain('θi 20.0 °C and θe −5.0 °C');
		expect(hf.sentence).toBe(`${hf.label} = ${hf.value}: ${hf.definition}.`);
		// Without bridged layers there is no second figure.
		expect(clearFieldHeatFlux(r)).toBeNull();
	});

	it('is the mean of a bridged wall, between Δθ/R′T and Δθ/R″T; the clear-field figure is labelled as such', () => {
		const r = analyseElement(timberWall);
		// Clear field (plasterboard, wool, sheathing, render): R = 0.13 + 0.05 + 3.5 + 0.05 + 0.04 + 0.04 =
		// 3.81 m²·K/W; through the stud 0.14/0.13 = 1.0769 instead of 3.5 → 1.3869 m²·K/W.
		// R′T = 1/(0.93667/3.81 + 0.06333/1.3869) = 3.4304; λ″ = 0.93667·0.04 + 0.06333·0.13 = 0.04570,
		// R″T = 0.31 + 0.14/0.04570 = 3.3735; RT = 3.4019, U = 0.29395, q = 25 · 0.29395 = 7.349 W/m².
		expect(r.rUpper).toBeCloseTo(3.4304, 3);
		expect(r.rLower).toBeCloseTo(3.3735, 3);
		const hf = elementHeatFlux(r);
		expect(hf.q).toBeCloseTo(7.349, 2);
		expect(hf.q).toBeGreaterThan(25 / r.rUpper!);
		expect(hf.q).toBeLessThan(25 / r.rLower!);
		expect(hf.q).toBeCloseTo(r.heatFluxElement, 10);
		// The profile's path runs through the wool: 25/3.81 = 6.562 W/m², not the element's figure.
		const clear = clearFieldHeatFlux(r)!;
		expect(clear.q).toBeCloseTo(25 / 3.81, 2);
		expect(clear.value).toBe('6.56 W/m²');
		expect(clear.label).toBe('Clear-field heat flux');
		expect(clear.definition).toContain("not the element's mean");
		expect(hf.value).not.toBe(clear.value);
	});
});

describe('not assessed: the reason comes from the result', () => {
	it('a floor on the ground with a climate: condensation not assessed because it is on the ground, fRsi assessed', () => {
		const r = analyseElement(groundFloor(true));
		expect(r.surface).toBeDefined();
		const why = condensationNotAssessed(r)!;
		expect(why.reason).toBe('ground');
		expect(why.short).toBe('not assessed: floor on the ground');
		expect(why.line).toBe('Not assessed for a floor in contact with the ground.');
		expect(why.sentence).not.toMatch(/climate is attached/);
		// The engine says the same in its notes.
		expect(r.notes.some((n) => n.includes('not assessed for a floor in contact with the ground'))).toBe(true);
		expect(surfaceNotAssessed(r)).toBeNull();
	});

	it('a floor on the ground without a climate is still not assessed because it is on the ground', () => {
		const r = analyseElement(groundFloor(false));
		expect(condensationNotAssessed(r)!.reason).toBe('ground');
		expect(surfaceNotAssessed(r)!.reason).toBe('no-climate');
	});

	it('a wall without a climate: no climate; with one: both checks ran', () => {
		const bare = analyseElement(cavityWall);
		expect(condensationNotAssessed(bare)!.short).toBe('not assessed: no climate');
		expect(surfaceNotAssessed(bare)!.sentence).toBe(
			'No climate is attached to this element: the surface-humidity check was not run.'
		);
		const r = analyseElement({
			...cavityWall,
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: COLD
		});
		expect(condensationNotAssessed(r)).toBeNull();
		expect(surfaceNotAssessed(r)).toBeNull();
	});

	it('no month colder outside than inside: the surface check does not apply, and says so', () => {
		// 25 °C outside in every month against 20 °C inside: fRsi,min has no meaning (ISO 13788:2012 clause 5).
		const r = analyseElement({
			...cavityWall,
			internal: { temperature: 20, relativeHumidity: 50 },
			climate: Array.from({ length: 12 }, (_, i) => ({ month: i + 1, temperature: 25, relativeHumidity: 60 }))
		});
		expect(r.surface).toBeUndefined();
		expect(surfaceNotAssessed(r)!.reason).toBe('no-cold-month');
		expect(surfaceNotAssessed(r)!.line).toBe('Not assessed: no month is colder outside than inside.');
	});
});

describe('the caution when the monthly method created moisture', () => {
	const condensing = (): NonNullable<ElementResult['condensation']> => {
		const r = analyseElement({
			...timberWall,
			internal: { temperature: 20, relativeHumidity: 60 },
			climate: COLD
		});
		expect(r.condensation!.outcome).not.toBe('none');
		return structuredClone(r.condensation!);
	};
	/** The condensation result with `massBalance` replaced (or removed, with `undefined`). */
	const withBalance = (created: number | undefined, conserving?: object) => {
		const c = condensing() as NonNullable<ElementResult['condensation']> & { massBalance?: unknown };
		if (created === undefined) delete c.massBalance;
		else
			c.massBalance = {
				created,
				conserving: {
					months: [],
					maxAccumulation: c.maxAccumulation - created,
					peakMonth: c.peakMonth,
					evaporatesFully: true,
					outcome: 'dries',
					created: 0,
					...conserving
				}
			};
		return c;
	};

	it('works without the field: results of engines before it give no caution', () => {
		expect(massBalanceCaution(withBalance(undefined))).toBeNull();
	});

	it('stays silent at or below 1 % of the peak, and for nothing created', () => {
		const c = condensing();
		expect(massBalanceCaution(withBalance(CREATED_CAUTION_FRACTION * c.maxAccumulation))).toBeNull();
		expect(massBalanceCaution(withBalance(0))).toBeNull();
		expect(massBalanceCaution(withBalance(-1))).toBeNull();
	});

	it('above 1 % of the peak: plain words, the conserving figures and outcome beside the standard’s', () => {
		const c = condensing();
		const created = 0.05 * c.maxAccumulation;
		const caution = massBalanceCaution(withBalance(created))!;
		expect(caution).not.toBeNull();
		expect(caution.created).toBe(created);
		expect(caution.text).toContain(`created ${created.toFixed(1)} g/m² of moisture over the year`);
		const peak = caution.rows.find((r) => r.label === 'Peak amount')!;
		expect(peak.standard).toBe(`${c.maxAccumulation.toFixed(1)} g/m²`);
		expect(peak.conserving).toBe(`${(c.maxAccumulation - created).toFixed(1)} g/m²`);
		const outcome = caution.rows.find((r) => r.label === 'Outcome')!;
		expect(outcome.conserving).toBe('dries out within the year');
		expect(caution.standardHeading).toContain('ISO 13788:2012');
		expect(caution.conservingHeading).toBe('Kept in mass balance');
	});

	it('a malformed field is ignored rather than printed', () => {
		expect(massBalanceCaution(withBalance(50, { outcome: 'unknown' }))).toBeNull();
		expect(massBalanceCaution(withBalance(50, { maxAccumulation: 'a lot' }))).toBeNull();
	});
});
