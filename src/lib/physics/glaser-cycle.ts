/**
 * The twelve months of the Glaser cycle in cycle order, from the start month (ISO 13788:2012,
 * clause 6): each month's line, rates and bookkeeping, the amounts carried into the next month.
 */
import type { GlaserMonth, GlaserMonthResult } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import type { MonthlySaturation } from './glaser-saturation';
import type { CycleStart } from './glaser-start';
import type { GlaserWork } from './glaser-work';
import { straightLine, tautLine } from './glaser-line';
import { pressuresAndRates } from './glaser-flux';
import {
	bookMonth,
	createdInMonth,
	monthResult,
	nodePressures,
	SECONDS_PER_DAY,
	type MonthBalance
} from './glaser-balance';

/** The months of one cycle. */
export interface CycleMonths {
	/** per month, in the order given */
	results: GlaserMonthResult[];
	/** month indices in cycle order */
	order: number[];
	/** per month, in the order given: condensation formed at some node */
	formed: boolean[];
	/** held over all nodes at the end of the cycle (its last month), kg/m² */
	finalTotal: number;
	/**
	 * moisture the months' booking created over the cycle, kg/m²: the sum over the months of the
	 * change in the total held minus the net vapour flux through the surfaces (see
	 * {@link createdInMonth}); above round-off only when some interface dries out within a month
	 */
	created: number;
	/**
	 * the first month (its position in cycle order) in which an interface held an amount at the
	 * start and dried out before the end, with the state at its start: the amounts per vapour node
	 * (work.startAmount, kg/m²), their total (kg/m²), the number of wet nodes and the moisture
	 * created before it (kg/m²); null when no interface dries out within a month
	 */
	firstDryOut: { position: number; total: number; wet: number; created: number } | null;
	/**
	 * the month with the most condensation formed (the first in cycle order of equal amounts) and
	 * its vapour pressures at every heat node (Pa), or null when none formed in any month
	 */
	mostCondensation: { month: number; pressure: number[] } | null;
}

/**
 * One month of the cycle (ISO 13788:2012, clause 6): the line (straight when nothing is wet and
 * the month does not condense from dry, otherwise taut with wet interfaces held at psat, Pa), the
 * pressures and rates along it, and the bookkeeping onto work.amount (kg/m²).
 * `wet` is the number of vapour nodes holding an amount at the start of the month.
 */
export function cycleMonth(
	vn: VapourNodes,
	month: GlaserMonth,
	temperature: number[],
	psat: number[],
	condensesWhenDry: boolean,
	wet: number,
	work: GlaserWork
): { result: GlaserMonthResult; balance: MonthBalance } {
	const vertices =
		wet === 0 && !condensesWhenDry ? straightLine(vn, month, work) : tautLine(vn, month, psat, true, work);
	pressuresAndRates(vn, vertices, work);
	const rateGm2: number[] = new Array(vn.count);
	const heldGm2: number[] = new Array(vn.count);
	const balance = bookMonth(vn, month.days, work, rateGm2, heldGm2);
	const vapourPressure = nodePressures(vn, work.pressure);
	const result = monthResult(month, temperature, psat, vapourPressure, rateGm2, heldGm2, balance);
	return { result, balance };
}

/**
 * Runs the months from `start.start` round the year once (ISO 13788:2012, clause 6), starting dry
 * (work.amount all zero) and carrying the amounts (kg/m²) from month to month. Amounts g/m² in
 * the results, pressures Pa.
 */
export function runCycle(
	vn: VapourNodes,
	months: readonly GlaserMonth[],
	sat: MonthlySaturation,
	start: CycleStart,
	work: GlaserWork
): CycleMonths {
	const nm = months.length;
	const results: GlaserMonthResult[] = new Array(nm);
	const order: number[] = new Array(nm);
	const formed: boolean[] = new Array(nm);
	let mostCondensation: CycleMonths['mostCondensation'] = null;
	let mostCondensed = 0;
	let total = 0;
	let wet = 0;
	let created = 0;
	let firstDryOut: CycleMonths['firstDryOut'] = null;
	const { amount, startAmount } = work;
	for (let c = 0; c < nm; c++) {
		const m = (start.start + c) % nm;
		// an interface can dry out only in a month that starts with something held: copy only then
		if (firstDryOut === null && wet > 0) for (let g = 0; g < vn.count; g++) startAmount[g] = amount[g];
		const { result, balance } = cycleMonth(
			vn,
			months[m],
			sat.temperature[m],
			sat.saturationPressure[m],
			start.condensesWhenDry[m],
			wet,
			work
		);
		order[c] = m;
		results[m] = result;
		formed[m] = balance.formed;
		if (firstDryOut === null && balance.ranDry) firstDryOut = { position: c, total, wet, created };
		created += createdInMonth(total, balance.total, months[m].days * SECONDS_PER_DAY, work);
		total = balance.total;
		wet = balance.wet;
		if (balance.condensed > mostCondensed) {
			mostCondensed = balance.condensed;
			mostCondensation = { month: m, pressure: work.pressure.slice() };
		}
	}
	return { results, order, formed, finalTotal: total, created, firstDryOut, mostCondensation };
}
