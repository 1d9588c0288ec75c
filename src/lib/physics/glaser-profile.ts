/**
 * The vapour-pressure profile for charting: the month with the most condensation formed, else the
 * coldest month, at every heat node (ISO 13788:2012, clause 6; psat by Annex E).
 */
import type { GlaserChain, GlaserMonth, VapourProfilePoint } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import type { MonthlySaturation } from './glaser-saturation';
import type { CycleMonths } from './glaser-cycle';
import type { GlaserWork } from './glaser-work';
import { tautLine } from './glaser-line';
import { pressuresAndRates } from './glaser-flux';
import { saturationPressure } from './moisture';

/**
 * Index of the month of the lowest external temperature (°C), the first of equal ones: the month
 * charted when none condenses (a choice for the chart, not a step of ISO 13788).
 */
export function coldestMonth(months: readonly GlaserMonth[]): number {
	let coldest = 0;
	for (let m = 1; m < months.length; m++)
		if (months[m].externalTemperature < months[coldest].externalTemperature) coldest = m;
	return coldest;
}

/**
 * The profile points of `month` at every heat node: position (mm), cumulative sd (m),
 * temperature θe + (θi − θe)·φ (°C), psat by ISO 13788:2012, Annex E, and `pressure` (Pa).
 */
export function profilePoints(
	chain: GlaserChain,
	vn: VapourNodes,
	month: GlaserMonth,
	pressure: readonly number[]
): VapourProfilePoint[] {
	const points: VapourProfilePoint[] = new Array(vn.elements + 1);
	for (let j = 0; j <= vn.elements; j++) {
		const t =
			month.externalTemperature + (month.internalTemperature - month.externalTemperature) * chain.phi[j];
		points[j] = {
			positionMm: chain.positionMm[j],
			sdM: vn.sdAtHeatNode[j],
			temperature: t,
			saturationPressure: saturationPressure(t),
			vapourPressure: pressure[j]
		};
	}
	return points;
}

/**
 * The charted profile (pressures Pa): the cycle's month with the most condensation formed, as
 * computed in the cycle (wet interfaces held at psat); when none formed, the coldest month with
 * the taut line of a dry construction (its pressures written into work.pressure).
 */
export function vapourProfile(
	chain: GlaserChain,
	vn: VapourNodes,
	months: readonly GlaserMonth[],
	sat: MonthlySaturation,
	cycle: CycleMonths,
	work: GlaserWork
): { month: number; points: VapourProfilePoint[] } {
	let m: number;
	let pressure: number[];
	if (cycle.mostCondensation !== null) {
		m = cycle.mostCondensation.month;
		pressure = cycle.mostCondensation.pressure;
	} else {
		m = coldestMonth(months);
		pressuresAndRates(vn, tautLine(vn, months[m], sat.saturationPressure[m], false, work), work);
		pressure = work.pressure;
	}
	return { month: months[m].month, points: profilePoints(chain, vn, months[m], pressure) };
}
