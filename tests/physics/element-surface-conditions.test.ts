// An element with surface conditions other than the conventional ones (ISO 6946:2017, Annex C, formulas
// from memory; checked against the annex's tables in surface-films.test.ts). Only the side a condition
// describes leaves Table 7: the inside emissivity sets Rsi, the outside emissivity or wind speed Rse; a
// given Rsi or Rse still wins. Worked by hand beside each check; σ = 5.670374419e-8 W/(m²·K⁴) (CODATA 2018).
import { describe, expect, it } from 'vitest';
import { analyseElement, parseElementInput, type ElementInput } from '../../src/lib/physics';

const brick = { name: 'Brick', thicknessMm: 215, lambda: 0.77, mu: 10 };
const wall = (extra: object = {}): ElementInput => ({ heatFlow: 'horizontal', layers: [brick], ...extra });
const hr0 = (c: number) => 4 * 5.670374419e-8 * (c + 273.15) ** 3;
const R_BRICK = 0.215 / 0.77;

describe('surface conditions on an element', () => {
	it('keeps Table 7 when none is given', () => {
		const r = analyseElement(wall());
		// RT = 0.13 + 0.215/0.77 + 0.04
		expect(r.rTotal).toBeCloseTo(0.13 + R_BRICK + 0.04, 12);
	});

	it('a low-emissivity inside face changes Rsi only', () => {
		const r = analyseElement(wall({ surfaceConditions: { internalEmissivity: 0.2 } }));
		// Rsi = 1/(2.5 + 0.2·hr0(20 °C)); Rse stays 0.04 (Table 7)
		const rsi = 1 / (2.5 + 0.2 * hr0(20));
		expect(r.rsi).toBeCloseTo(rsi, 12);
		expect(r.rse).toBe(0.04);
		expect(r.rTotal).toBeCloseTo(rsi + R_BRICK + 0.04, 12);
		expect(r.notes.join(' ')).toContain('ISO 6946:2017, Annex C');
	});

	it('a sheltered wall (1 m/s) changes Rse only', () => {
		const r = analyseElement(wall({ surfaceConditions: { windSpeed: 1 } }));
		// Rse = 1/(4 + 4·1 + 0.9·hr0(0 °C)) = 1/(8 + 4.1597) = 0.0822 (the annex's table: 0.08)
		expect(r.rse).toBeCloseTo(1 / (8 + 0.9 * hr0(0)), 12);
		expect(Math.round(r.rse * 100) / 100).toBe(0.08);
		expect(r.rsi).toBe(0.13);
	});

	it('a given Rse wins over the wind speed', () => {
		const r = analyseElement(wall({ rse: 0.06, surfaceConditions: { windSpeed: 1 } }));
		expect(r.rse).toBe(0.06);
	});

	it('refuses an emissivity out of range, naming the field', () => {
		const p = parseElementInput(wall({ surfaceConditions: { internalEmissivity: 2 } }));
		expect(p.ok ? [] : p.issues.map((i) => i.path)).toEqual(['surfaceConditions.internalEmissivity']);
	});
});
