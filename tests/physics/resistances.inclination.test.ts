// Heat-flow direction of an inclined roof. ISO 6946:2017, 6.8 and the note to Table 7 (from memory;
// the note to Table 1 in the 2007 edition): the values under "horizontal" apply to heat flow within
// ±30° of the horizontal plane. The heat flows normal to the roof, at 90° − pitch from the horizontal,
// so a pitch of 60° or more takes Rsi 0.13 (horizontal) and a flatter one Rsi 0.10 (upward, heating
// conditions); Rse 0.04 throughout (Table 7). Air layers follow the same direction (Table 8).
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	heatFlowForInclination,
	parseElementInput,
	unventilatedAirLayerResistance,
	type ElementInput
} from '../../src/lib/physics';

const rafterRoof = (
	inclinationDeg?: number,
	heatFlow: ElementInput['heatFlow'] = 'upward'
): ElementInput => ({
	heatFlow,
	...(inclinationDeg === undefined ? {} : { inclinationDeg }),
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21 }, // R = 0.059524
		{ name: 'mineral wool', thicknessMm: 150, lambda: 0.035 } // R = 4.285714
	]
});
const layersR = 0.0125 / 0.21 + 0.15 / 0.035;

describe('inclined roofs: heat-flow direction by ISO 6946:2017, 6.8, note to Table 7 (from memory)', () => {
	it('the rule: horizontal at 60° or more from the horizontal, otherwise the sense given', () => {
		expect(heatFlowForInclination(0, 'upward')).toBe('upward');
		expect(heatFlowForInclination(20, 'upward')).toBe('upward');
		expect(heatFlowForInclination(45, 'upward')).toBe('upward'); // heat flow 45° from horizontal: outside ±30°
		expect(heatFlowForInclination(59.9, 'upward')).toBe('upward');
		expect(heatFlowForInclination(60, 'upward')).toBe('horizontal'); // exactly 30° from horizontal: within
		expect(heatFlowForInclination(90, 'upward')).toBe('horizontal');
		expect(heatFlowForInclination(20, 'downward')).toBe('downward');
	});

	it('20°: upward, Rsi 0.10 m²·K/W (Table 7); U = 1/(0.10 + ΣR + 0.04)', () => {
		const r = analyseElement(rafterRoof(20));
		expect(r.rsi).toBe(0.1);
		expect(r.rse).toBe(0.04);
		expect(r.uValue).toBeCloseTo(1 / (0.1 + layersR + 0.04), 12);
		expect(r.notes[0]).toMatch(
			/inclined 20° from the horizontal.*70° from the horizontal plane.*upward heat flow apply/
		);
	});

	it('60°: horizontal, Rsi 0.13 m²·K/W (Table 7), although the heat flow was given as upward', () => {
		const r = analyseElement(rafterRoof(60));
		expect(r.rsi).toBe(0.13);
		expect(r.uValue).toBeCloseTo(1 / (0.13 + layersR + 0.04), 12);
		expect(r.notes[0]).toMatch(/within ±30° of it, the values for horizontal heat flow apply/);
	});

	it('an air layer takes the same direction (Table 8: 50 mm upward 0.16, horizontal 0.18)', () => {
		const withAir = (deg: number): ElementInput => ({
			...rafterRoof(deg),
			layers: [...rafterRoof(deg).layers, { name: 'air', thicknessMm: 50, air: 'unventilated' }]
		});
		expect(unventilatedAirLayerResistance(50, 'upward')).toBe(0.16);
		expect(analyseElement(withAir(20)).layers[2].r).toBe(0.16);
		expect(analyseElement(withAir(70)).layers[2].r).toBe(0.18);
	});

	it('without an inclination nothing changes: the heat flow as given', () => {
		expect(analyseElement(rafterRoof()).rsi).toBe(0.1);
		expect(analyseElement(rafterRoof()).notes.some((n) => n.includes('inclined'))).toBe(false);
	});

	it('refuses what contradicts it, naming the field', () => {
		const issues = (raw: unknown) => {
			const p = parseElementInput(raw);
			return p.ok ? [] : p.issues;
		};
		expect(issues(rafterRoof(95))).toEqual([
			{ path: 'inclinationDeg', message: 'must be 0–90° from the horizontal (0 flat, 90 vertical)' }
		]);
		expect(issues(rafterRoof(20, 'horizontal')).map((i) => i.path)).toEqual(['heatFlow']);
		expect(issues(rafterRoof(70, 'horizontal'))).toEqual([]);
		expect(issues({ ...rafterRoof(70), roofSpace: 'boards-and-felt' }).map((i) => i.path)).toEqual([
			'inclinationDeg'
		]);
		expect(
			issues({ ...rafterRoof(70, 'downward'), ground: { perimeterM: 40, areaM2: 100 } }).map((i) => i.path)
		).toEqual(['inclinationDeg']);
	});
});
