// ISO 6946 thermal resistance and U-value. Values of ISO 6946:2017 are quoted from memory (table
// and clause numbers as recalled; the 2007 edition carries the same values in Tables 1 and 2).
// Hand calculations are shown beside each expected number.
import { describe, expect, expectTypeOf, it } from 'vitest';
import {
	AIR_LAYER_RESISTANCE,
	analyseElement,
	parseElementInput,
	RSE,
	RSI,
	unventilatedAirLayerResistance,
	type ElementInput,
	type HeatFlow
} from '../../src/lib/physics';
import { closedFormSeries } from './helpers';

describe('surface resistances', () => {
	it('Rsi 0.10 / 0.13 / 0.17 and Rse 0.04 (ISO 6946:2017 Table 7, from memory)', () => {
		expect(RSI.upward).toBe(0.1);
		expect(RSI.horizontal).toBe(0.13);
		expect(RSI.downward).toBe(0.17);
		expect(RSE).toBe(0.04);
	});

	it('one heat-flow type: the three directions of Table 7, as the element input takes them', () => {
		// upward, horizontal (within ±30° of the horizontal plane), downward: ISO 6946:2017, 6.8 and Table 7 (from memory)
		expectTypeOf<ElementInput['heatFlow']>().toEqualTypeOf<HeatFlow>();
		expect(Object.keys(RSI)).toEqual(['upward', 'horizontal', 'downward']);
		for (const heatFlow of Object.keys(RSI) as HeatFlow[])
			expect(
				parseElementInput({ heatFlow, layers: [{ name: 'board', thicknessMm: 100, lambda: 0.1 }] }).ok
			).toBe(true);
	});

	it('are chosen by heat-flow direction and can be overridden', () => {
		const layers: ElementInput['layers'] = [{ name: 'board', thicknessMm: 100, lambda: 0.1 }];
		// R = 0.1/0.1 = 1.0; RT = Rsi + 1.0 + 0.04
		expect(analyseElement({ heatFlow: 'upward', layers }).rTotal).toBeCloseTo(1.14, 12);
		expect(analyseElement({ heatFlow: 'horizontal', layers }).rTotal).toBeCloseTo(1.17, 12);
		expect(analyseElement({ heatFlow: 'downward', layers }).rTotal).toBeCloseTo(1.21, 12);
		const o = analyseElement({ heatFlow: 'horizontal', rsi: 0.25, rse: 0, layers });
		expect(o.rTotal).toBeCloseTo(1.25, 12);
		expect(o.rsi).toBe(0.25);
		expect(o.rse).toBe(0);
	});
});

describe('unventilated air layers (ISO 6946:2017 Table 8, from memory)', () => {
	it('reproduces every row of the table', () => {
		// thickness mm: upward / horizontal / downward (ISO 6946:2017 Table 8, from memory)
		const rows: [number, number, number, number][] = [
			[0, 0, 0, 0],
			[5, 0.11, 0.11, 0.11],
			[7, 0.13, 0.13, 0.13],
			[10, 0.15, 0.15, 0.15],
			[15, 0.16, 0.17, 0.17],
			[25, 0.16, 0.18, 0.19],
			[50, 0.16, 0.18, 0.21],
			[100, 0.16, 0.18, 0.22],
			[300, 0.16, 0.18, 0.23]
		];
		for (const [d, up, hor, down] of rows) {
			expect(unventilatedAirLayerResistance(d, 'upward')).toBeCloseTo(up, 12);
			expect(unventilatedAirLayerResistance(d, 'horizontal')).toBeCloseTo(hor, 12);
			expect(unventilatedAirLayerResistance(d, 'downward')).toBeCloseTo(down, 12);
		}
		expect(AIR_LAYER_RESISTANCE.horizontal).toHaveLength(rows.length);
	});

	it('interpolates linearly between rows (ISO 6946:2017 6.9.2, from memory)', () => {
		// 20 mm horizontal: 0.17 + (20 − 15)/(25 − 15)·(0.18 − 0.17) = 0.175
		expect(unventilatedAirLayerResistance(20, 'horizontal')).toBeCloseTo(0.175, 12);
		// 12 mm downward: 0.15 + 2/5·0.02 = 0.158
		expect(unventilatedAirLayerResistance(12, 'downward')).toBeCloseTo(0.158, 12);
		// 200 mm downward: 0.22 + 100/200·0.01 = 0.225
		expect(unventilatedAirLayerResistance(200, 'downward')).toBeCloseTo(0.225, 12);
		expect(() => unventilatedAirLayerResistance(301, 'upward')).toThrow(/outside/);
	});

	it('an element with a 50 mm cavity takes 0.18 m²·K/W for it', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'block', thicknessMm: 100, lambda: 0.5 },
				{ name: 'cavity', thicknessMm: 50, air: 'unventilated' },
				{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
			]
		});
		// RT = 0.13 + 0.2 + 0.18 + 0.102/0.77 + 0.04 = 0.682468
		expect(r.rTotal).toBeCloseTo(0.6824675, 6);
		expect(r.layers[1].r).toBeCloseTo(0.18, 12);
	});
});

describe('ventilated air layers', () => {
	const base = (air: ElementInput['layers'][number]): ElementInput => ({
		heatFlow: 'horizontal',
		layers: [
			{ name: 'block', thicknessMm: 100, lambda: 0.5 },
			air,
			{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
		]
	});

	it('slightly ventilated: RT = (1500 − Av)/1000·RT,u + (Av − 500)/1000·RT,v (ISO 6946:2017 6.9.3, from memory)', () => {
		const r = analyseElement(
			base({ name: 'cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 1000 })
		);
		// RT,u = 0.13 + 0.2 + 0.18 + 0.132468 + 0.04 = 0.682468; RT,v = 0.13 + 0.2 + 0.13 = 0.46
		// RT = 0.5·0.682468 + 0.5·0.46 = 0.571234 → U = 1.750597
		expect(r.rTotal).toBeCloseTo(0.5712338, 6);
		expect(r.uValue).toBeCloseTo(1.750597, 5);
		// The profile path reproduces RT: heat flux at design temperatures = ΔT/RT.
		const dT = r.designTemperatures.internal - r.designTemperatures.external;
		expect(r.heatFlux).toBeCloseTo(dT / r.rTotal, 9);
	});

	it('slightly ventilated: the resistance outside the air layer is limited to 0.15 in RT,u (ISO 6946:2017 6.9.3, from memory)', () => {
		const input = base({ name: 'cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 700 });
		input.layers[2] = { name: 'brick', thicknessMm: 215, lambda: 0.77 }; // R 0.279 > 0.15
		const r = analyseElement(input);
		// RT,u = 0.13 + 0.2 + 0.18 + 0.15 + 0.04 = 0.70; RT,v = 0.46; RT = 0.8·0.70 + 0.2·0.46 = 0.652
		expect(r.rTotal).toBeCloseTo(0.652, 9);
	});

	it('well ventilated: the layer and all outside it are disregarded, Rse = Rsi (ISO 6946:2017 6.9.4, from memory)', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 },
				{ name: 'mineral wool', thicknessMm: 100, lambda: 0.035 },
				{ name: 'OSB', thicknessMm: 12, lambda: 0.13 },
				{ name: 'cavity', thicknessMm: 25, air: 'well-ventilated' },
				{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
			]
		});
		// RT = 0.13 + 0.0125/0.21 + 0.1/0.035 + 0.012/0.13 + 0.13 = 3.268974 → U = 0.305906
		expect(r.rse).toBe(0.13);
		expect(r.rTotal).toBeCloseTo(3.268974, 6);
		expect(r.uValue).toBeCloseTo(0.305906, 6);
		expect(r.layers.map((l) => l.disregarded)).toEqual([false, false, false, true, true]);
		expect(r.interfaces[5].temperature).toBe(r.designTemperatures.external);
		expect(r.notes.join(' ')).toMatch(/well-ventilated/);
	});
});

describe('homogeneous elements: U = 1/(Rsi + Σ d/λ + Rse) (ISO 6946:2017 6.7.1, from memory)', () => {
	it('one layer: 220 mm brick, λ 0.77, horizontal', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [{ name: 'brick', thicknessMm: 220, lambda: 0.77 }]
		});
		// RT = 0.13 + 0.22/0.77 + 0.04 = 0.455714 → U = 2.194357
		expect(r.rTotal).toBeCloseTo(0.4557143, 6);
		expect(r.uValue).toBeCloseTo(2.194357, 5);
		expect(r.uValueRounded).toBe(2.19);
		expect(r.interfaces).toHaveLength(2);
		expect(r.rUpper).toBeUndefined();
	});

	it('layer by resistance, and a zero-resistance membrane changes nothing thermally', () => {
		const a = analyseElement({
			heatFlow: 'downward',
			layers: [
				{ name: 'timber floor', thicknessMm: 22, resistance: 0.16 },
				{ name: 'membrane', thicknessMm: 0.2, resistance: 0 },
				{ name: 'insulation', thicknessMm: 100, lambda: 0.04 }
			]
		});
		// RT = 0.17 + 0.16 + 0 + 2.5 + 0.04 = 2.87
		expect(a.rTotal).toBeCloseTo(2.87, 12);
		expect(a.interfaces[1].temperature).toBeCloseTo(a.interfaces[2].temperature, 12);
	});

	it('interface temperatures and heat flux equal the closed-form series at the design temperatures', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			designTemperatures: { internal: 21, external: -4 },
			layers: [
				{ name: 'plaster', thicknessMm: 13, lambda: 0.57 },
				{ name: 'block', thicknessMm: 100, lambda: 0.19 },
				{ name: 'PIR', thicknessMm: 90, lambda: 0.022 },
				{ name: 'cavity', thicknessMm: 50, air: 'unventilated' },
				{ name: 'brick', thicknessMm: 102.5, lambda: 0.77 }
			]
		});
		const rs = [0.13, 0.013 / 0.57, 0.1 / 0.19, 0.09 / 0.022, 0.18, 0.1025 / 0.77, 0.04];
		const ref = closedFormSeries(rs, 21, -4);
		expect(r.heatFlux).toBeCloseTo(ref.flux, 10);
		expect(r.heatFluxElement).toBeCloseTo(ref.flux, 10);
		r.interfaces.forEach((p, i) => expect(p.temperature).toBeCloseTo(ref.values[i + 1], 9));
		expect(r.interfaces.map((p) => p.positionMm)).toEqual([0, 13, 113, 203, 253, 355.5]);
		// per-layer faces agree with the interfaces
		r.layers.forEach((l, i) => {
			expect(l.temperatureInside).toBeCloseTo(r.interfaces[i].temperature, 12);
			expect(l.temperatureOutside).toBeCloseTo(r.interfaces[i + 1].temperature, 12);
		});
		// the fine profile is monotone and starts/ends at the surfaces
		expect(r.profile[0].temperature).toBeCloseTo(ref.values[1], 9);
		expect(r.profile[r.profile.length - 1].temperature).toBeCloseTo(ref.values[6], 9);
		for (let i = 1; i < r.profile.length; i++)
			expect(r.profile[i].temperature).toBeLessThanOrEqual(r.profile[i - 1].temperature + 1e-12);
	});
});

describe('rounding of the reported U-value', () => {
	const wall = (lambda: number, thicknessMm: number): ElementInput => ({
		heatFlow: 'horizontal',
		layers: [{ name: 'x', thicknessMm, lambda }]
	});

	it('keeps U unrounded and reports it to 2 decimal places by default, stating the convention', () => {
		const r = analyseElement(wall(0.035, 150));
		// RT = 0.17 + 4.285714 = 4.455714 → U = 0.224431 → 0.22
		expect(r.uValue).toBeCloseTo(0.224431, 6);
		expect(r.uValueRounded).toBe(0.22);
		expect(r.roundingConvention).toMatch(/2 decimal places/);
		expect(r.roundingConvention).toMatch(/two significant figures/);
	});

	it('rounds half away from zero even when binary round-off sits just below the half', () => {
		// RT chosen so that U = 0.145 exactly in decimal: RT = 1/0.145 = 6.896552 → layer R = 6.726552
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [{ name: 'x', thicknessMm: 100, resistance: 1 / 0.145 - 0.17 }]
		});
		expect(r.uValueRounded).toBe(0.15);
	});

	it('can report two significant figures instead (the form ISO 6946 states, from memory)', () => {
		const r = analyseElement({ ...wall(0.035, 400), rounding: { mode: 'significant', digits: 2 } });
		// RT = 0.17 + 11.428571 = 11.598571 → U = 0.086217 → 0.086
		expect(r.uValueRounded).toBe(0.086);
		expect(r.roundingConvention).toMatch(/2 significant figures/);
	});
});
