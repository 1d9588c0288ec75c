// Combined method for bridged layers (ISO 6946:2017 6.7.2) and ΔU corrections (ISO 6946:2017
// Annex F). Published worked examples: Scottish Government, "Tables of U-values and thermal
// conductivity", Annex 6.B "Worked examples of U-value calculations using the combined method"
// (2020), examples 6.B.2 and 6.B.3 — their R'T, R''T and U as transcribed in a public open-source
// test suite that cites that document; we have not checked them against the PDF itself.
import { describe, expect, it } from 'vitest';
import {
	airGapCorrection,
	analyseElement,
	applyCorrections,
	combinedMethod,
	fastenerCorrection,
	type ElementInput
} from '../../src/lib/physics';

const timberFrame = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
		{
			name: 'mineral wool quilt between studs',
			thicknessMm: 140,
			lambda: 0.04,
			bridge: { lambda: 0.12, fraction: 0.15 }
		},
		{ name: 'timber-based sheathing', thicknessMm: 9, lambda: 0.13 },
		{ name: 'cavity', thicknessMm: 50, air: 'unventilated' }, // 0.18 m²·K/W, as in the example
		{ name: 'brick outer leaf', thicknessMm: 102, lambda: 0.77 }
	]
});

describe('combined method against published worked examples', () => {
	it("6.B.2 timber framed wall: R'T 3.435, R''T 3.304, U 0.297 (Scottish Government Annex 6.B, 2020)", () => {
		const r = analyseElement(timberFrame());
		expect(r.rUpper!).toBeCloseTo(3.435, 3);
		expect(r.rLower!).toBeCloseTo(3.304, 3);
		expect(r.uValue).toBeCloseTo(0.297, 3);
		expect(r.uValueRounded).toBe(0.3);
		// e = (R'T − R''T)/(2 RT) (ISO 6946:2017 6.7.2.5, from memory)
		expect(r.relativeError!).toBeCloseTo((r.rUpper! - r.rLower!) / (2 * r.rTotal), 12);
		expect(r.warnings).toEqual([]);
	});

	it("6.B.3 cavity wall, lightweight masonry leaf and insulated dry-lining (two bridged layers): R'T 3.617, R''T 3.136, U 0.30", () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
				{
					name: 'mineral wool between studs',
					thicknessMm: 89,
					lambda: 0.038,
					bridge: { lambda: 0.13, fraction: 0.118 }
				},
				{
					name: 'AAC blocks',
					thicknessMm: 125,
					lambda: 0.11,
					bridge: { lambda: 0.88, fraction: 0.067, name: 'mortar' }
				},
				{ name: 'cavity', thicknessMm: 50, air: 'unventilated' },
				{ name: 'brick outer leaf', thicknessMm: 102, lambda: 0.77 }
			]
		});
		// The published figures round intermediate values; we agree within 0.002 m²·K/W.
		expect(Math.abs(r.rUpper! - 3.617)).toBeLessThan(0.002);
		expect(Math.abs(r.rLower! - 3.136)).toBeLessThan(0.002);
		expect(r.uValueRounded).toBe(0.3);
	});
});

describe('combined method, hand calculation (ISO 6946:2017 6.7.2, from memory)', () => {
	it('one bridged layer: sections, limits and equivalent resistance', () => {
		// Rsi 0.13, insulation 100 mm λ 0.04 (R 2.5) bridged by timber λ 0.13 (R 0.769231) at f = 0.1, Rse 0.04.
		// Sections: clear 0.13 + 2.5 + 0.04 = 2.67; bridge 0.13 + 0.769231 + 0.04 = 0.939231.
		// 1/R'T = 0.9/2.67 + 0.1/0.939231 = 0.337079 + 0.106470 = 0.443549 → R'T = 2.254543
		// 1/Rj = 0.9/2.5 + 0.1/0.769231 = 0.36 + 0.13 = 0.49 → Rj = 2.040816; R''T = 2.210816
		// RT = 2.232680, e = (2.254543 − 2.210816)/(2·2.232680) = 0.009792
		const c = combinedMethod(0.13, 0.04, [{ r: 2.5, rBridge: 0.1 / 0.13, fraction: 0.1 }]);
		expect(c.rUpper).toBeCloseTo(2.254544, 5);
		expect(c.rLower).toBeCloseTo(2.210816, 5);
		expect(c.rTotal).toBeCloseTo(2.23268, 5);
		expect(c.relativeError).toBeCloseTo(0.009792, 5);
		expect(c.rEquivalent[0]).toBeCloseTo(2.040816, 6);
		expect(c.sections.map((s) => s.fraction)).toEqual([0.9, 0.1]);
	});

	it('bridging by member width and centres equals the same fraction', () => {
		const byFraction = timberFrame();
		const byWidth = timberFrame();
		byWidth.layers[1].bridge = { lambda: 0.12, widthMm: 90, centresMm: 600 }; // f = 0.15
		expect(analyseElement(byWidth).uValue).toBeCloseTo(analyseElement(byFraction).uValue, 12);
	});

	it('warns when R′T/R″T > 1.5 (error > 20 %) and when insulation is bridged by metal (ISO 6946 scope, from memory)', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 12.5, lambda: 0.21 },
				{
					name: 'insulation with steel studs',
					thicknessMm: 100,
					lambda: 0.035,
					bridge: { lambda: 50, fraction: 0.02 }
				}
			]
		});
		expect(r.rUpper! / r.rLower!).toBeGreaterThan(1.5);
		expect(r.relativeError!).toBeGreaterThan(0.2);
		expect(r.warnings.join(' ')).toMatch(/outside its range/);
		expect(r.warnings.join(' ')).toMatch(/metal/);
	});

	it('without bridged layers all three limits coincide and are not reported', () => {
		const r = analyseElement({ heatFlow: 'upward', layers: [{ name: 'x', thicknessMm: 100, lambda: 0.04 }] });
		expect(r.rUpper).toBeUndefined();
		expect(r.relativeError).toBeUndefined();
	});
});

describe('ΔU corrections (ISO 6946:2017 Annex F, from memory)', () => {
	// Wall: plasterboard 12.5/0.21, mineral wool 100/0.035 (R1 = 2.857143), brick 102/0.77.
	// RT = 0.13 + 0.059524 + 2.857143 + 0.132468 + 0.04 = 3.219134, U = 0.310643
	const wall = (extra: Partial<ElementInput['layers'][number]>, corrections?: 'always'): ElementInput => ({
		heatFlow: 'horizontal',
		...(corrections ? { corrections } : {}),
		layers: [
			{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
			{ name: 'mineral wool', thicknessMm: 100, lambda: 0.035, ...extra },
			{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
		]
	});

	it('air gaps: ΔUg = ΔU″·(R1/RT)² with ΔU″ = 0 / 0.01 / 0.04 for levels 0 / 1 / 2 (Table F.1)', () => {
		expect(airGapCorrection(0, 2.857143, 3.219134)).toBe(0);
		// level 1: 0.01·(2.857143/3.219134)² = 0.007877
		expect(airGapCorrection(1, 2.857143, 3.219134)).toBeCloseTo(0.0078775, 6);
		// level 2: 0.04·(…)² = 0.031510
		expect(airGapCorrection(2, 2.857143, 3.219134)).toBeCloseTo(0.0315098, 6);
	});

	it('fasteners: ΔUf = α·λf·Af·nf/d0·(R1/RT,h)², α = 0.8 through, 0.8·d1/d0 recessed (F.3)', () => {
		// stainless steel λ 17, Ø4 mm (Af = 12.566 mm²), 5 per m², d0 = 100 mm:
		// 0.8·17·12.566e-6·5/0.1·(2.857143/3.219134)² = 0.0067314
		const f = { lambda: 17, areaMm2: Math.PI * 4, perM2: 5 };
		expect(fastenerCorrection(f, 100, 2.857143, 3.219134)).toBeCloseTo(0.0067314, 6);
		// recessed, 80 mm of 100 mm: × 0.8 → 0.0053851
		expect(fastenerCorrection({ ...f, penetrationMm: 80 }, 100, 2.857143, 3.219134)).toBeCloseTo(
			0.0053851,
			6
		);
		// plastic fixings (λ < 1 W/(m·K)) need no correction
		expect(fastenerCorrection({ ...f, lambda: 0.3 }, 100, 2.857143, 3.219134)).toBe(0);
	});

	it('corrections below 3 % of U are omitted and reported (ISO 6946:2017 clause 7)', () => {
		const r = analyseElement(wall({ airGapLevel: 1 }));
		// ΔU = 0.007877 = 2.54 % of U → omitted
		expect(r.deltaU).toBeCloseTo(0.0078775, 6);
		expect(r.correctionsApplied).toBe(false);
		expect(r.uValue).toBeCloseTo(0.3106425, 6);
		expect(r.notes.join(' ')).toMatch(/below 3 %, and is omitted/);
		const forced = analyseElement(wall({ airGapLevel: 1 }, 'always'));
		expect(forced.correctionsApplied).toBe(true);
		expect(forced.uValue).toBeCloseTo(0.3106425 + 0.0078775, 6);
	});

	it('corrections of 3 % or more are applied: air gaps level 1 plus fasteners', () => {
		const r = analyseElement(
			wall({ airGapLevel: 1, fasteners: { lambda: 17, areaMm2: Math.PI * 4, perM2: 5 } })
		);
		// ΔU = 0.007877 + 0.006731 = 0.014609 = 4.7 % of U → U = 0.325251
		expect(r.deltaUAirGaps).toBeCloseTo(0.0078775, 6);
		expect(r.deltaUFasteners).toBeCloseTo(0.0067314, 6);
		expect(r.correctionsApplied).toBe(true);
		expect(r.uValue).toBeCloseTo(0.3252514, 6);
		expect(r.uUncorrected).toBeCloseTo(0.3106425, 6);
	});

	it('applyCorrections follows the 3 % rule exactly at its edge', () => {
		expect(applyCorrections(1, 0.0299).applied).toBe(false);
		expect(applyCorrections(1, 0.03).applied).toBe(true);
		expect(applyCorrections(1, 0.01, 'always')).toEqual({ applied: true, u: 1.01 });
	});
});
