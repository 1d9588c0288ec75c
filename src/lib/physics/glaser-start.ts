/**
 * Where the Glaser cycle starts (ISO 13788:2012, clause 6): in the first month in which
 * condensation is predicted for a dry construction after a month in which it is not.
 */
import type { GlaserMonth } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';

/** The months that condense from dry, and the month the cycle starts in. */
export interface CycleStart {
	/** per month (in the order given): condensation is predicted for a dry construction */
	condensesWhenDry: boolean[];
	/** some month condenses from dry */
	any: boolean;
	/** every month condenses from dry */
	every: boolean;
	/** index of the first month of the cycle (0 when no month, or every month, condenses) */
	start: number;
}

/**
 * Whether a dry construction condenses in a month (ISO 13788:2012, clause 6): true when some
 * interior saturation pressure `psat` (Pa) lies below the straight line from pi to pe (Pa) over
 * the cumulative sd (m), by more than a round-off margin. For a dry construction the taut line
 * touches a node exactly then (the lower hull of the points has a corner there), and a touching
 * node is a convex corner where more vapour arrives than leaves: condensation.
 */
export function condensesWhenDry(vn: VapourNodes, month: GlaserMonth, psat: readonly number[]): boolean {
	const sd = vn.sd;
	const last = vn.count - 1;
	const pi = month.internalVapourPressure;
	const slope = (month.externalVapourPressure - pi) / sd[last];
	for (let g = 1; g < last; g++) {
		const line = pi + slope * sd[g];
		if (psat[g] < line - 1e-9 * (Math.abs(psat[g]) + 1)) return true;
	}
	return false;
}

/**
 * The start of the cycle (ISO 13788:2012, clause 6): the first month (in the order given, taken
 * as a closed year) that condenses from dry after one that does not; the first month when none or
 * all of them condense. `psat[m]` are the month's saturation pressures per vapour node, Pa.
 */
export function cycleStart(
	vn: VapourNodes,
	months: readonly GlaserMonth[],
	psat: readonly (readonly number[])[]
): CycleStart {
	const nm = months.length;
	const wets: boolean[] = new Array(nm);
	let any = false;
	let every = true;
	for (let m = 0; m < nm; m++) {
		const c = condensesWhenDry(vn, months[m], psat[m]);
		wets[m] = c;
		any ||= c;
		every &&= c;
	}
	let start = 0;
	if (any && !every) {
		for (let m = 0; m < nm; m++) {
			if (wets[m] && !wets[(m + nm - 1) % nm]) {
				start = m;
				break;
			}
		}
	}
	return { condensesWhenDry: wets, any, every, start };
}
