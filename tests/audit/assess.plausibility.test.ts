// The audit's `input-implausible` flag (low): the engine's plausibility warnings of an element as
// entered, raised once, and left out where a medium flag of the same kind already stands on the
// layer. Thresholds are common practice, no source (src/lib/audit/plausible.ts names each).
import { describe, expect, it } from 'vitest';
import { auditDwelling } from '../../src/lib/audit/assess';
import { plausibleForMaterial, SMALLEST_PRODUCT_MM } from '../../src/lib/audit/plausible';
import { bundleOf, cleanWallLayers, element, library, linked } from './bundles';

const implausible = (b: ReturnType<typeof bundleOf>) =>
	auditDwelling(b).flags.filter((f) => f.code === 'input-implausible');

describe('input-implausible (low)', () => {
	it('none on a clean wall', () => {
		expect(implausible(bundleOf([element('e1', cleanWallLayers())], { issued: false }))).toEqual([]);
	});

	it('an inside temperature outside 5–35 °C, on the element', () => {
		const b = bundleOf(
			[element('e1', cleanWallLayers(), { internal: { temperature: 40, humidityClass: 3 } })],
			{
				issued: false
			}
		);
		const flags = implausible(b);
		expect(flags).toHaveLength(1);
		expect(flags[0]).toMatchObject({ severity: 'low', elementId: 'e1' });
		expect(flags[0].layerIndex).toBeUndefined();
		expect(flags[0].reason).toMatch(
			/^Front wall \(External wall\): The inside temperature of 40 °C is outside the usual 5–35 °C/
		);
		expect(flags[0].reason).toMatch(/\(common practice, no source\)\.$/);
	});

	it("a layer thinner than its category's thinnest product, judged by the revision it names", () => {
		const lib = library();
		// 0.5 mm of PIR: a thickness typed in cm or m; insulation starts at about 10 mm
		const b = bundleOf(
			[element('e1', [linked(lib.plaster, 13), linked(lib.pir, 0.5), linked(lib.brick, 102)])],
			{
				issued: false
			}
		);
		const flags = implausible(b);
		expect(flags.map((f) => [f.layerIndex, f.severity])).toEqual([[1, 'low']]);
		expect(flags[0].reason).toMatch(/thinner than the thinnest insulation \(about 10 mm\)/);
		expect(SMALLEST_PRODUCT_MM.insulation).toBe(10);
	});

	it('uses the ranges the layer carries from the library, without a revision', () => {
		const layer = {
			name: 'Board',
			thicknessMm: 1500,
			lambda: 0.2,
			mu: 5,
			plausible: plausibleForMaterial({ category: 'insulation' })
		};
		const b = bundleOf([element('e1', [layer])], { issued: false });
		expect(implausible(b).map((f) => f.reason.replace(/:.*/, ''))).toEqual([
			'Front wall (External wall)',
			'Front wall (External wall)'
		]);
		expect(implausible(b).map((f) => f.layerIndex)).toEqual([0, 0]);
	});

	it('is not raised again where the medium λ or thickness flag stands on the layer', () => {
		const lib = library();
		lib.pir.lambda = 0.35; // outside insulation's λ range: lambda-implausible (medium) already
		lib.pir.thicknessMaxMm = 150;
		const b = bundleOf(
			[element('e1', [linked(lib.plaster, 13), linked(lib.pir, 200), linked(lib.brick, 102)])],
			{
				revisions: Object.values(lib),
				issued: false
			}
		);
		const flags = auditDwelling(b).flags;
		expect(flags.some((f) => f.code === 'lambda-implausible' && f.layerIndex === 1)).toBe(true);
		expect(flags.some((f) => f.code === 'thickness-implausible' && f.layerIndex === 1)).toBe(true);
		expect(flags.filter((f) => f.code === 'input-implausible')).toEqual([]);
	});

	it('what a layer carries from its material: the category λ range and source, stated thicknesses, thinnest product', () => {
		expect(plausibleForMaterial({ category: 'membranes', thicknessMinMm: 0.1, thicknessMaxMm: 2 })).toEqual({
			category: 'membranes',
			lambdaMin: 0.1,
			lambdaMax: 0.6,
			lambdaSource: 'ISO 10456:2007, Table 3 (from memory): sheet plastics, bitumen, rubber',
			thicknessMinMm: 0.1,
			thicknessMaxMm: 2,
			smallestMm: 0.05
		});
		expect(plausibleForMaterial({ category: 'other' })).toBeUndefined();
	});
});
