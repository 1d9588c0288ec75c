// The surface check of a junction against the months of a climate (ISO 13788:2012, 4.2.3 and 5.2, as
// recalled: pi from the inside conditions, psat,min = pi/0.8, fRsi,min = (θsi,min − θe)/(θi − θe)).
// Reference: θsi,min 12.6 °C and fRsi,min 0.70 at 20 °C/50 % inside and −5 °C outside (DIN 4108-2:2013,
// from memory). The 0.75 figure for dwellings: common practice, no source.
import { describe, expect, it } from 'vitest';
import { monthlyCriteria, surfaceVerdict } from '../../src/lib/junctions/surface';

const months = (temps: number[], rh = 80) =>
	temps.map((temperature, i) => ({ month: i + 1, temperature, relativeHumidity: rh }));

describe('fRsi against the climate', () => {
	it('20 °C / 50 % inside, −5 °C outside: fRsi,min ≈ 0.70', () => {
		const [m] = monthlyCriteria({ temperature: 20, relativeHumidity: 50 }, months([-5]));
		expect(m.fRsiMin!).toBeCloseTo(0.7, 2);
	});

	it('picks the month of the highest fRsi,min as critical and judges fRsi against it and against 0.75', () => {
		const v = surfaceVerdict(0.72, { temperature: 20, relativeHumidity: 50 }, months([-5, 5, 10]));
		expect(v.critical!.month).toBe(1);
		expect(v.critical!.pass).toBe(true);
		expect(v.ruleOfThumb).toEqual({ value: 0.75, pass: false, source: 'common practice, no source' });
		// with a humidity class the vapour excess follows the outside temperature (class 3, 810 Pa × 1.1 at θe ≤ 0)
		const c = surfaceVerdict(0.8, { temperature: 20, humidityClass: 3 }, months([0]));
		const pe = 0.8 * 610.5;
		const pi = pe + 1.1 * 810;
		// θsi,min over water: 237.3·ln(p/610.5)/(17.269 − ln(p/610.5)) with p = pi/0.8 (ISO 13788 Annex E)
		const l = Math.log(pi / 0.8 / 610.5);
		const theta = (237.3 * l) / (17.269 - l);
		expect(c.critical!.fRsiMin).toBeCloseTo(theta / 20, 10);
	});

	it('without a climate there is no critical month, only the rule of thumb', () => {
		const v = surfaceVerdict(0.8, { temperature: 20 }, null);
		expect(v.critical).toBeNull();
		expect(v.ruleOfThumb.pass).toBe(true);
	});
});
