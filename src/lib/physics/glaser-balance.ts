/**
 * The month's bookkeeping of the amounts at the vapour nodes (ISO 13788:2012, clause 6): the
 * month's rates taken over its length, condensate added, evaporation taken from what an interface
 * holds, never below zero; the totals formed, evaporated and held; and the month's result.
 */
import type { GlaserMonth, GlaserMonthResult } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import type { GlaserWork } from './glaser-work';

/** seconds in a day (a month's length is its number of days, ISO 13788:2012, clause 6) */
export const SECONDS_PER_DAY = 86400;
/** amounts below this are taken as zero, kg/m² (10⁻⁶ g/m²) */
export const ZERO_AMOUNT = 1e-9;
/** a rate below this is no condensation, kg/(m²·s) */
export const ZERO_RATE = 1e-16;

/** Totals of one month over all vapour nodes. */
export interface MonthBalance {
	/** formed in the month, kg/m² */
	condensed: number;
	/** evaporated in the month (at most what was held), kg/m² */
	evaporated: number;
	/** held at the end of the month, kg/m² */
	total: number;
	/** vapour nodes holding an amount at the end of the month */
	wet: number;
	/** some vapour node condenses in the month (rate above 10⁻¹⁶ kg/(m²·s)) */
	formed: boolean;
	/**
	 * some vapour node that held an amount at the start of the month would give off more than it
	 * held over the month's length: it dries out part-way through the month (see {@link bookMonth})
	 */
	ranDry: boolean;
}

/**
 * What a vapour node holds at the end of a month, kg/m²: `before` plus the month's `amount`
 * (condensation +, evaporation −), taken as zero below 10⁻⁹ kg/m² and never negative: an
 * interface cannot give off more than it holds (ISO 13788:2012, clause 6).
 */
export function heldAfter(before: number, amount: number): number {
	const after = before + amount;
	return after < ZERO_AMOUNT ? 0 : after;
}

/**
 * Books the month's rates (work.rate, kg/(m²·s)) over its `days` (ISO 13788:2012, clause 6:
 * amounts over each month's length) onto the amounts carried from earlier months (work.amount,
 * kg/m², updated). Writes per vapour node the month's amount `rateGm2` (rate × length, g/m²) and
 * what is held at the end, `heldGm2` (g/m²).
 *
 * The rates are those of the line of the whole month: an interface that dries out within the
 * month is booked with the full month's evaporation, cut at what it held, and the other nodes'
 * rates are those of the line held at its saturation pressure for the whole month. The vapour it
 * gives off beyond what it held comes from nothing: the month's stock then changes by more than
 * the net vapour flux through the surfaces (`ranDry` is set). The standard's result keeps this
 * booking; glaser-conserving.ts repeats the cycle with the month split where an interface dries
 * out, and states how much moisture the booking created.
 */
export function bookMonth(
	vn: VapourNodes,
	days: number,
	work: GlaserWork,
	rateGm2: number[],
	heldGm2: number[]
): MonthBalance {
	const { rate, amount: held } = work;
	const seconds = days * SECONDS_PER_DAY;
	let condensed = 0;
	let evaporated = 0;
	let formed = false;
	let total = 0;
	let wet = 0;
	let ranDry = false;
	for (let g = 0; g < vn.count; g++) {
		const r = rate[g];
		const amount = r * seconds;
		const before = held[g];
		if (before > 0 && before + amount < 0) ranDry = true;
		const after = heldAfter(before, amount);
		held[g] = after;
		if (r > ZERO_RATE) {
			condensed += amount;
			formed = true;
		} else if (amount < 0) {
			evaporated += before - after;
		}
		total += after;
		if (after > 0) wet++;
		rateGm2[g] = amount * 1000;
		heldGm2[g] = after * 1000;
	}
	return { condensed, evaporated, total, wet, formed, ranDry };
}

/**
 * The moisture a month's booking created, kg/m²: the change of the total held over the month
 * (`totalAfter` − `totalBefore`, kg/m²) minus the net vapour flux into the construction over the
 * `seconds` its line lasts, (work.fluxIn − work.fluxOut) × seconds. Zero (to round-off) when the
 * month keeps its mass balance; positive when moisture appears that no flux brought in.
 */
export function createdInMonth(
	totalBefore: number,
	totalAfter: number,
	seconds: number,
	work: GlaserWork
): number {
	return totalAfter - totalBefore - (work.fluxIn - work.fluxOut) * seconds;
}

/**
 * The vapour pressure of every vapour node, Pa: that of its first heat node in `pressure` (Pa;
 * the members of a vapour node share one pressure, ISO 13788:2012, clause 6).
 */
export function nodePressures(vn: VapourNodes, pressure: readonly number[]): number[] {
	const vp: number[] = new Array(vn.count);
	for (let g = 0; g < vn.count; g++) vp[g] = pressure[vn.first[g]];
	return vp;
}

/**
 * The reported month (ISO 13788:2012, clause 6): its boundary conditions, and per vapour node the
 * temperature (°C), saturation pressure and vapour pressure (Pa), the month's amount and what is
 * held (g/m²); totals of `balance` (kg/m²) in g/m².
 */
export function monthResult(
	month: GlaserMonth,
	temperature: number[],
	saturationPressure: number[],
	vapourPressure: number[],
	rateGm2: number[],
	heldGm2: number[],
	balance: MonthBalance
): GlaserMonthResult {
	return {
		month: month.month,
		days: month.days,
		externalTemperature: month.externalTemperature,
		externalVapourPressure: month.externalVapourPressure,
		internalTemperature: month.internalTemperature,
		internalVapourPressure: month.internalVapourPressure,
		temperature,
		saturationPressure,
		vapourPressure,
		rate: rateGm2,
		accumulatedAt: heldGm2,
		accumulated: balance.total * 1000,
		condensed: balance.condensed * 1000,
		evaporated: balance.evaporated * 1000
	};
}
