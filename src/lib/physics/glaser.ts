/**
 * Monthly interstitial-condensation cycle by the Glaser method, ISO 13788:2012 clause 6
 * (clause numbers as recalled; the steps below are cited by the clause, its sub-clauses are not
 * recalled reliably).
 *
 * Input is a chain of vapour nodes from the internal surface (node 0) to the external surface
 * (node N): the sublayers of every layer (each R ≤ 0.25 m²·K/W), their sd-values and the
 * dimensionless temperature φ = (θ − θe)/(θi − θe) of every node from the heat solve.
 * Nodes joined by a zero-sd element share one vapour pressure and are handled as one
 * vapour node ("group"); its saturation pressure is the lowest of its members.
 *
 * Each month: the vapour-pressure line runs from pi to pe, held at psat at every interface that
 * is still wet from earlier months, and is drawn taut under the saturation pressures (the lower
 * convex hull of the points between fixed nodes), so that it touches psat at the condensation
 * interfaces. Between the touching and fixed nodes, pressures and fluxes come from the
 * finite-element kernel with g = δ0/sd. The difference between the flux in and the flux out of a
 * touching node is its condensation rate (negative: evaporation), taken over the month's length.
 *
 * The steps, one file each beside this one:
 *   glaser-nodes.ts       vapour nodes: cumulative sd, conductances δ0/sd, zero-sd groups
 *   glaser-saturation.ts  each month's temperatures and saturation pressures per vapour node
 *   glaser-start.ts       which months condense from dry, and the start month of the cycle
 *   glaser-line.ts        the month's vapour-pressure line: straight, or taut under psat with
 *                         wet interfaces held (where condensation forms)
 *   glaser-flux.ts        pressures along the line and the flux balance at its vertices (rates)
 *   glaser-balance.ts     the month's bookkeeping: amounts added, evaporated, carried; its result
 *   glaser-cycle.ts       the months in cycle order, amounts carried from month to month
 *   glaser-outcome.ts     peak total and month, peak at one interface, months, outcome
 *   glaser-profile.ts     the vapour-pressure profile charted
 *   glaser-conserving.ts  the moisture the monthly booking created, and the same cycle with each
 *                         month split where an interface dries out (mass balance kept)
 *   glaser-work.ts        scratch arrays reused month by month
 *   glaser-types.ts       input and output types (re-exported here)
 */

import type { GlaserChain, GlaserMonth, GlaserResult } from './glaser-types';
import { vapourNodes } from './glaser-nodes';
import { monthlySaturation } from './glaser-saturation';
import { cycleStart } from './glaser-start';
import { createGlaserWork } from './glaser-work';
import { runCycle } from './glaser-cycle';
import { yearlyOutcome } from './glaser-outcome';
import { vapourProfile } from './glaser-profile';
import { massBalance, runConservingCycle } from './glaser-conserving';
import type { GlaserConservingResult, GlaserMassBalance } from './glaser-types';

export type {
	NodeKind,
	GlaserChain,
	GlaserMonth,
	GlaserNode,
	GlaserMonthResult,
	VapourProfilePoint,
	GlaserResult,
	GlaserConservingResult,
	GlaserMassBalance
} from './glaser-types';

/**
 * Run the twelve-month Glaser cycle (ISO 13788:2012, clause 6). `months` must hold the twelve
 * calendar months in order 1 … 12. The cycle starts in the first month in which condensation is
 * predicted (for a dry construction) after a month in which it is not; accumulation is carried
 * from month to month and never falls below zero. Amounts in g/m², pressures in Pa, sd in m,
 * temperatures °C. Throws a RangeError when the chain's total sd is zero.
 */
export function runGlaser(chain: GlaserChain, months: readonly GlaserMonth[]): GlaserResult {
	return standardCycle(chain, months).glaser;
}

/**
 * {@link runGlaser}, and beside its result the mass balance of its months: the moisture they
 * created, and the same cycle with each month split where an interface dries out
 * (glaser-conserving.ts). Same units and errors as runGlaser.
 */
export function runGlaserWithBalance(
	chain: GlaserChain,
	months: readonly GlaserMonth[]
): { glaser: GlaserResult; massBalance: GlaserMassBalance } {
	const { glaser, vn, sat, start, work, cycle, year } = standardCycle(chain, months);
	return { glaser, massBalance: massBalance(vn, months, sat, start, work, cycle, year) };
}

/** The steps of the standard's cycle and its result, with what the mass balance needs of them. */
function standardCycle(chain: GlaserChain, months: readonly GlaserMonth[]) {
	const vn = vapourNodes(chain);
	const sat = monthlySaturation(chain, vn, months);
	const start = cycleStart(vn, months, sat.saturationPressure);
	const work = createGlaserWork(chain.elements + 1, vn.count);
	const cycle = runCycle(vn, months, sat, start, work);
	const year = yearlyOutcome(cycle, start.any);
	const glaser: GlaserResult = {
		nodes: vn.nodes,
		startMonth: start.any ? months[start.start].month : null,
		months: cycle.results,
		maxAccumulation: year.maxAccumulation,
		peakMonth: year.peakMonth,
		maxAtInterface: year.maxAtInterface,
		maxAtInterfaceNode: year.maxAtInterfaceNode,
		evaporatesFully: year.outcome !== 'accumulates',
		condensationMonths: year.condensationMonths,
		outcome: year.outcome,
		surfaceCondensationMonths: year.surfaceCondensationMonths,
		// before the conserving cycle, which reuses the scratch space
		vapourProfile: vapourProfile(chain, vn, months, sat, cycle, work),
		condensesEveryMonth: start.every
	};
	return { glaser, vn, sat, start, work, cycle, year };
}

/**
 * The conserving cycle alone (glaser-conserving.ts): the twelve months of {@link runGlaser} with
 * each month split where an interface dries out, always computed month by month (runGlaserWithBalance
 * takes the standard's months as they are when nothing dries out within a month). Same units and
 * errors as runGlaser.
 */
export function runGlaserConserving(
	chain: GlaserChain,
	months: readonly GlaserMonth[]
): GlaserConservingResult {
	const vn = vapourNodes(chain);
	const sat = monthlySaturation(chain, vn, months);
	const start = cycleStart(vn, months, sat.saturationPressure);
	return runConservingCycle(vn, months, sat, start, createGlaserWork(chain.elements + 1, vn.count));
}
