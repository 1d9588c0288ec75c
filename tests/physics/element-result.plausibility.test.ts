// Plausibility warnings: allowed but unusual inputs, each a reason to look and never a refusal. The
// thresholds are this product's (common practice, no source): a layer over 1 m, an inside temperature
// outside 5–35 °C; the material's stated thicknesses, its category's λ range and thinnest product come
// in through the layer (`plausible`), as the library states them. Expected figures are the inputs
// themselves; the test also checks that U stays 1/ΣR (ISO 6946:2017, 6.7.1) with the warnings present.
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	elementResultSchema,
	parseElementInput,
	plausibilityWarnings,
	type ElementInput,
	type Layer
} from '../../src/lib/physics';

const INSULATION = { category: 'insulation', lambdaMin: 0.015, lambdaMax: 0.065, smallestMm: 10 };
const wall = (over: Partial<Layer> = {}, internal = 20): ElementInput => ({
	heatFlow: 'horizontal',
	designTemperatures: { internal, external: -5 },
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
		{ name: 'PIR board', thicknessMm: 100, lambda: 0.022, plausible: { ...INSULATION }, ...over },
		{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
	]
});
const checks = (input: ElementInput) => analyseElement(input).plausibility!.map((w) => [w.check, w.path]);

describe('plausibility warnings (common practice, no source, unless the library names one)', () => {
	it('none for an ordinary wall; the list is always part of the result and of its schema', () => {
		const r = analyseElement(wall());
		expect(r.plausibility).toEqual([]);
		expect(elementResultSchema.safeParse(r).success).toBe(true);
	});

	it('a layer thicker than 1 m', () => {
		expect(checks(wall({ thicknessMm: 1200, plausible: undefined }))).toEqual([
			['layer-too-thick', 'layers.1.thicknessMm']
		]);
		expect(checks(wall({ thicknessMm: 1000, plausible: undefined }))).toEqual([]); // 1 m itself is allowed
	});

	it('a layer thinner than the thinnest product of its category (insulation 10 mm)', () => {
		const r = analyseElement(wall({ thicknessMm: 0.1 }));
		expect(r.plausibility).toEqual([
			{
				kind: 'plausibility',
				check: 'layer-too-thin',
				path: 'layers.1.thicknessMm',
				layerIndex: 1,
				value: 0.1,
				message:
					'Layer 2 “PIR board” is 0.1 mm thick, thinner than the thinnest insulation (about 10 mm): check that the thickness is in mm.',
				source: 'common practice, no source'
			}
		]);
	});

	it("a thickness outside the material's stated range, either side", () => {
		const stated = { ...INSULATION, thicknessMinMm: 20, thicknessMaxMm: 150 };
		expect(checks(wall({ thicknessMm: 160, plausible: stated }))).toEqual([
			['thickness-outside-range', 'layers.1.thicknessMm']
		]);
		const thin = analyseElement(wall({ thicknessMm: 15, plausible: stated })).plausibility![0];
		expect(thin.check).toBe('thickness-outside-range');
		expect(thin.message).toMatch(/stated to come 20–150 mm/);
		// only one thickness warning per layer, the most specific: 5 mm is under 20 and under 10
		expect(checks(wall({ thicknessMm: 5, plausible: stated }))).toEqual([
			['thickness-outside-range', 'layers.1.thicknessMm']
		]);
	});

	it('a λ outside what its category allows, with the range and its source', () => {
		const w = analyseElement(
			wall({ lambda: 0.35, plausible: { ...INSULATION, lambdaSource: 'common practice, no source: foams' } })
		).plausibility!;
		expect(w.map((x) => [x.check, x.path, x.value])).toEqual([
			['lambda-outside-range', 'layers.1.lambda', 0.35]
		]);
		expect(w[0].message).toMatch(
			/λ = 0.35 W\/\(m·K\) is outside 0.015–0.065 W\/\(m·K\), what insulation usually has/
		);
		expect(w[0].source).toBe('common practice, no source: foams');
	});

	it('an inside temperature outside 5–35 °C, from the internal conditions or the profile', () => {
		expect(checks(wall({}, 40))).toEqual([['inside-temperature', 'designTemperatures.internal']]);
		expect(checks(wall({}, 35))).toEqual([]);
		expect(checks(wall({}, 4))).toEqual([['inside-temperature', 'designTemperatures.internal']]);
		const withInternal: ElementInput = { ...wall(), internal: { temperature: 2, relativeHumidity: 50 } };
		expect(checks(withInternal)).toEqual([['inside-temperature', 'internal.temperature']]);
	});

	it('never refuses an input nor changes its figures', () => {
		const odd = wall({ thicknessMm: 1200, lambda: 0.35 }, 40);
		expect(parseElementInput(odd).ok).toBe(true);
		const r = analyseElement(odd);
		expect(r.plausibility!.length).toBe(3);
		// U = 1/(Rsi 0.13 + ΣR + Rse 0.04), ISO 6946:2017 6.7.1 and Table 7
		expect(r.uValue).toBeCloseTo(1 / (0.13 + 0.0125 / 0.21 + 1.2 / 0.35 + 0.102 / 0.77 + 0.04), 12);
		const plain = analyseElement({ ...odd, layers: odd.layers.map((l) => ({ ...l, plausible: undefined })) });
		expect(r.uValue).toBe(plain.uValue);
		expect(r.warnings).toEqual(plain.warnings);
	});

	it('refuses a range that is not one, naming the field', () => {
		const p = parseElementInput(wall({ plausible: { lambdaMin: 0.1, lambdaMax: 0.05 } }));
		expect(p.ok ? [] : p.issues).toEqual([
			{ path: 'layers.1.plausible.lambdaMax', message: 'must be at least lambdaMin' }
		]);
	});

	it('is safe on an input not yet validated', () => {
		expect(plausibilityWarnings({ heatFlow: 'horizontal', layers: [] } as ElementInput)).toEqual([]);
	});
});
