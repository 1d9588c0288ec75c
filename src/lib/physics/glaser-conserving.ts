/**
 * The monthly Glaser cycle kept in mass balance. The standard's month (ISO 13788:2012, clause 6)
 * holds every interface that is wet at its start at saturation for the whole month; one that
 * dries out part-way keeps giving off vapour it no longer has, which leaves through the surfaces
 * or condenses at the next interface (glaser-balance.ts, `bookMonth`). Within a month the
 * conditions are constant, so the line and its rates are constant until an interface dries out:
 * here each month is split at that instant, the interface is no longer held, the line is drawn
 * again and the rest of the month continues with the new rates. The split is exact, and a month
 * in which nothing dries out is the standard's month, computed the same way.
 *
 * The standard's result stays the reported one; this cycle is set beside it with the moisture
 * the standard's booking created (`GlaserMassBalance`).
 */
import type {
	GlaserConservingResult,
	GlaserMassBalance,
	GlaserMonth,
	GlaserMonthResult
} from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import type { MonthlySaturation } from './glaser-saturation';
import type { CycleStart } from './glaser-start';
import type { CycleMonths } from './glaser-cycle';
import type { YearlyOutcome } from './glaser-outcome';
import type { GlaserWork } from './glaser-work';
import { straightLine, tautLine } from './glaser-line';
import { pressuresAndRates } from './glaser-flux';
import {
	bookMonth,
	createdInMonth,
	heldAfter,
	monthResult,
	nodePressures,
	SECONDS_PER_DAY,
	ZERO_AMOUNT,
	ZERO_RATE,
	type MonthBalance
} from './glaser-balance';
import { classifyOutcome, peakAccumulation } from './glaser-outcome';

/**
 * Two dry-out instants closer than this fraction of the part of the month are one instant (the
 * interfaces dry out together); a margin for round-off, not a physical constant.
 */
const SAME_INSTANT = 1e-12;

/**
 * The time, s, after which the first wet vapour node (work.amount > 0, kg/m²) runs dry at the
 * current rates (work.rate, kg/(m²·s)), when one does within `span` s (its amount plus its rate
 * over `span` is below zero, the test of `bookMonth`); Infinity when none does.
 */
export function firstDryOut(vn: VapourNodes, work: GlaserWork, span: number): number {
	const { amount, rate } = work;
	let first = Infinity;
	for (let g = 0; g < vn.count; g++) {
		const before = amount[g];
		const r = rate[g];
		if (before > 0 && before + r * span < 0) {
			const t = before / -r;
			if (t < first) first = t;
		}
	}
	return first;
}

/**
 * Books `span` s of the current line (work.rate, kg/(m²·s)) onto work.amount (kg/m²): amounts
 * added or taken, never below zero; a vapour node whose amount runs out at the instant `dryOut`
 * (s; the end of the part when it ends at a dry-out, else 0) or within {@link SAME_INSTANT} of it
 * is set to exactly zero. Adds each node's booked amount to `booked` (kg/m²) and the condensed
 * and evaporated totals to `sums` (kg/m²); returns whether some node condensed (rate above
 * 10⁻¹⁶ kg/(m²·s)).
 */
export function bookPart(
	vn: VapourNodes,
	span: number,
	dryOut: number,
	work: GlaserWork,
	booked: number[],
	sums: { condensed: number; evaporated: number }
): boolean {
	const { rate, amount: held } = work;
	const limit = dryOut * (1 + SAME_INSTANT);
	let formed = false;
	for (let g = 0; g < vn.count; g++) {
		const r = rate[g];
		const before = held[g];
		let change = r * span;
		let after: number;
		if (before > 0 && r < 0 && before / -r <= limit) {
			after = 0;
			change = -before;
		} else {
			after = heldAfter(before, change);
		}
		held[g] = after;
		if (r > ZERO_RATE) {
			sums.condensed += change;
			formed = true;
		} else if (change < 0) {
			sums.evaporated += before - after;
		}
		booked[g] += change;
	}
	return formed;
}

/** One month of the conserving cycle: its result, totals and the moisture its booking created. */
export interface ConservingMonth {
	result: GlaserMonthResult;
	balance: MonthBalance;
	/** kg/m², see {@link createdInMonth} (zero to round-off) */
	created: number;
	/** number of parts the month was split into (1: the standard's month) */
	parts: number;
}

/**
 * One month (ISO 13788:2012, clause 6) split at the instants interfaces dry out. The first line
 * is the standard's (straight when nothing is wet and the month does not condense from dry,
 * otherwise taut with wet interfaces held at psat, Pa). When no wet interface runs dry within the
 * month, the month is booked exactly as the standard books it. Otherwise the line's rates run
 * until the first interface dries out; the line is drawn again with only the interfaces still
 * wet held (those that condensed in the first part included) and the rest of the month continues,
 * as often as interfaces dry out. `wet` is the number of vapour nodes holding an amount at the
 * start; `totalBefore` their total, kg/m². The result's `rate` is each node's booked amount over
 * the month (g/m²), its vapour pressures those of the month's last part.
 */
export function conservingMonth(
	vn: VapourNodes,
	month: GlaserMonth,
	temperature: number[],
	psat: number[],
	condensesWhenDry: boolean,
	wet: number,
	totalBefore: number,
	work: GlaserWork
): ConservingMonth {
	const seconds = month.days * SECONDS_PER_DAY;
	const vertices =
		wet === 0 && !condensesWhenDry ? straightLine(vn, month, work) : tautLine(vn, month, psat, true, work);
	pressuresAndRates(vn, vertices, work);
	const rateGm2: number[] = new Array(vn.count);
	const heldGm2: number[] = new Array(vn.count);
	let dryOut = firstDryOut(vn, work, seconds);
	if (dryOut === Infinity) {
		const balance = bookMonth(vn, month.days, work, rateGm2, heldGm2);
		const vapourPressure = nodePressures(vn, work.pressure);
		return {
			result: monthResult(month, temperature, psat, vapourPressure, rateGm2, heldGm2, balance),
			balance,
			created: createdInMonth(totalBefore, balance.total, seconds, work),
			parts: 1
		};
	}
	const booked: number[] = new Array(vn.count);
	for (let g = 0; g < vn.count; g++) booked[g] = 0;
	const sums = { condensed: 0, evaporated: 0 };
	let formed = false;
	let netFlux = 0;
	let left = seconds;
	let parts = 0;
	// Each split ends the hold of at least one interface, and the line only falls as holds end;
	// the cap is a guard, never reached in practice: the rest of the month is then booked whole.
	const maxParts = 2 * vn.count + 2;
	for (;;) {
		parts++;
		const split = dryOut < left && parts < maxParts;
		const span = split ? dryOut : left;
		formed = bookPart(vn, span, split ? dryOut : 0, work, booked, sums) || formed;
		netFlux += (work.fluxIn - work.fluxOut) * span;
		left -= span;
		if (!(left > 0)) break;
		pressuresAndRates(vn, tautLine(vn, month, psat, true, work), work);
		dryOut = firstDryOut(vn, work, left);
	}
	let total = 0;
	let wetAfter = 0;
	for (let g = 0; g < vn.count; g++) {
		const after = work.amount[g];
		total += after;
		if (after > 0) wetAfter++;
		rateGm2[g] = booked[g] * 1000;
		heldGm2[g] = after * 1000;
	}
	const balance: MonthBalance = {
		condensed: sums.condensed,
		evaporated: sums.evaporated,
		total,
		wet: wetAfter,
		formed,
		ranDry: true
	};
	const vapourPressure = nodePressures(vn, work.pressure);
	return {
		result: monthResult(month, temperature, psat, vapourPressure, rateGm2, heldGm2, balance),
		balance,
		created: total - totalBefore - netFlux,
		parts
	};
}

/** An amount of kg/m² in g/m², taken as zero below 10⁻⁶ g/m² (round-off of the sums). */
function gramsOrZero(kg: number): number {
	return Math.abs(kg) < ZERO_AMOUNT ? 0 : kg * 1000;
}

/**
 * Where a conserving cycle resumes from a standard's cycle: the months before `position` (in cycle
 * order) are the standard's, taken as they are; the state at its start is the standard's.
 */
export interface CycleResume {
	/** position in cycle order of the first month computed */
	position: number;
	/** the standard's months, by calendar index (those before `position` are taken) */
	results: readonly GlaserMonthResult[];
	/** amount per vapour node at the start of that month, kg/m² */
	amount: readonly number[];
	/** their total, kg/m² */
	total: number;
	/** number of wet vapour nodes */
	wet: number;
	/** moisture created by the months before, kg/m² */
	created: number;
}

/**
 * The conserving cycle (ISO 13788:2012, clause 6, with every month split where an interface
 * dries out, {@link conservingMonth}): the same start month and dry start as the standard's,
 * amounts carried from month to month in work.amount. Without `resume` every month is computed
 * from a dry start; with it, the months before `resume.position` are the standard's (in which no
 * interface dries out within a month, so they are the conserving months already) and the cycle
 * continues from the standard's state. Peak, month, outcome as the standard's
 * (glaser-outcome.ts); amounts g/m².
 */
export function runConservingCycle(
	vn: VapourNodes,
	months: readonly GlaserMonth[],
	sat: MonthlySaturation,
	start: CycleStart,
	work: GlaserWork,
	resume?: CycleResume
): GlaserConservingResult {
	const nm = months.length;
	const results: GlaserMonthResult[] = new Array(nm);
	const order: number[] = new Array(nm);
	const from = resume ? resume.position : 0;
	for (let g = 0; g < vn.count; g++) work.amount[g] = resume ? resume.amount[g] : 0;
	let total = resume ? resume.total : 0;
	let wet = resume ? resume.wet : 0;
	let created = resume ? resume.created : 0;
	for (let c = 0; c < from; c++) {
		const m = (start.start + c) % nm;
		order[c] = m;
		results[m] = resume!.results[m];
	}
	for (let c = from; c < nm; c++) {
		const m = (start.start + c) % nm;
		const month = conservingMonth(
			vn,
			months[m],
			sat.temperature[m],
			sat.saturationPressure[m],
			start.condensesWhenDry[m],
			wet,
			total,
			work
		);
		order[c] = m;
		results[m] = month.result;
		created += month.created;
		total = month.balance.total;
		wet = month.balance.wet;
	}
	const peak = peakAccumulation(results, order);
	const outcome = classifyOutcome(start.any, total);
	return {
		months: results,
		maxAccumulation: peak.maxAccumulation,
		peakMonth: peak.peakMonth,
		evaporatesFully: outcome !== 'accumulates',
		outcome,
		created: gramsOrZero(created)
	};
}

/**
 * The mass balance of the standard's cycle `cycle` (with its yearly figures `year`): the moisture
 * its months created (g/m², see {@link GlaserMassBalance}), and the conserving cycle. A month in
 * which no interface dries out is the same month in both cycles, computed the same way, so the
 * standard's months up to the first month in which an interface dries out are taken as they are
 * (the same objects) instead of being computed twice, and the conserving cycle resumes from the
 * standard's state there (work.startAmount); with no such month, the standard's figures are
 * the conserving ones.
 */
export function massBalance(
	vn: VapourNodes,
	months: readonly GlaserMonth[],
	sat: MonthlySaturation,
	start: CycleStart,
	work: GlaserWork,
	cycle: CycleMonths,
	year: YearlyOutcome
): GlaserMassBalance {
	const created = gramsOrZero(cycle.created);
	const split = cycle.firstDryOut;
	if (split === null) {
		return {
			created,
			conserving: {
				months: cycle.results,
				maxAccumulation: year.maxAccumulation,
				peakMonth: year.peakMonth,
				evaporatesFully: year.outcome !== 'accumulates',
				outcome: year.outcome,
				created
			}
		};
	}
	const resume: CycleResume = {
		position: split.position,
		results: cycle.results,
		amount: work.startAmount,
		total: split.total,
		wet: split.wet,
		created: split.created
	};
	return { created, conserving: runConservingCycle(vn, months, sat, start, work, resume) };
}
