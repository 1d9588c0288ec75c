// The report's method section for a basement, an edge-insulated slab and an element beside an
// unheated space: it names the standard's method and states every intermediate with its value, from
// the engine's own result (figures are the hand calculations of tests/physics/element-basement.test.ts
// and element-unheated-space.test.ts: ISO 13370:2017, 8.3, 8.4 and edge insulation; ISO 6946:2017,
// 6.10.3; ISO 13789's air change; from memory). The elements are invented.
import { describe, expect, it } from 'vitest';
import { analyseElement, type ElementInput } from '../../src/lib/physics';
import { methodKind, methodParagraphs } from '../../src/lib/reports/method';

const floor = (r: number, g: Partial<NonNullable<ElementInput['ground']>>): ElementInput => ({
	heatFlow: 'downward',
	layers: [{ name: 'Insulation', thicknessMm: r * 40, lambda: 0.04, mu: 50 }],
	ground: { perimeterM: 40, areaM2: 100, ...g } as ElementInput['ground']
});

describe('method paragraphs of the new element types', () => {
	it('a heated basement: B′, dt, dw, Ubf, Ubw, H and U′', () => {
		const r = analyseElement(floor(0.5, { basement: { kind: 'heated', depthM: 2.5, wallR: 1.5 } }));
		const t = methodParagraphs(r).join('\n');
		expect(methodKind(r)).toBe('ground');
		expect(t).toMatch(/ISO 13370:2017, 8\.3/);
		for (const s of [
			'B′ = A/(0.5·P) = 100/(0.5·40) = 5.00 m',
			'dt = ',
			'= 1.720 m',
			'dw = ',
			'= 3.340 m',
			'Ubf = ',
			'0.3938',
			'Ubw = ',
			'0.3426',
			'H = A·Ubf + z·P·Ubw',
			'73.64 W/K',
			'U′ = H/(A + z·P) = 73.64/200.00 = 0.3682'
		])
			expect(t).toContain(s);
	});

	it('an unheated basement: Uf with Rsi on both faces and the basement’s loss', () => {
		const r = analyseElement(
			floor(1.66, {
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
		const t = methodParagraphs(r).join('\n');
		expect(t).toMatch(/ISO 13370:2017, 8\.3 and 8\.4/);
		for (const s of [
			'Uf = 1/(Rsi + Rf + Rsi) = 1/(0.17 + 1.660 + 0.17) = 0.5000',
			'0.33·n·V = 24.75 W/K',
			'= 188.0',
			'U = 0.3950',
			'ISO 13789'
		])
			expect(t).toContain(s);
	});

	it('edge insulation: U0, R′, d′, Δψ and U', () => {
		const r = analyseElement(
			floor(0.1, {
				edge: { orientation: 'horizontal', widthM: 1, insulationThicknessM: 0.05, insulationR: 2 }
			})
		);
		const t = methodParagraphs(r).join('\n');
		for (const s of [
			'U0 = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1) = 0.6963',
			'R′ = Rn − dn/λg = 1.975',
			'd′ = R′·λg = 3.950 m',
			'Δψ = −(λg/π)',
			'\u22120.3495',
			'U = U0 + 2·Δψ/B′',
			'0.5565'
		])
			expect(t).toContain(s);
	});

	it('an unheated space: ISO 6946’s method, ISO 13789’s air change, Ai, ΣAe·Ue, n, V and Ru', () => {
		const r = analyseElement({
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
				volumeM3: 60
			}
		});
		expect(methodKind(r)).toBe('unheated-space');
		const t = methodParagraphs(r).join('\n');
		for (const s of [
			'ISO 6946:2017, 6.10.3',
			'ISO 13789',
			'Ai = 20 m²',
			'ΣAe·Ue = 118.00 W/K',
			'n = 3 h⁻¹',
			'V = 60 m³',
			'0.33·n·V = 59.40 W/K',
			'Ru = 20/177.40 = 0.1127',
			'U0 = 0.5000',
			'b = Hue/(Hiu + Hue) = 0.947',
			'RT = Rsi + ΣR + Ru + Rse = 2.113'
		])
			expect(t).toContain(s);
	});
});
