/**
 * The yearly outcome of the Glaser cycle (ISO 13788:2012, clause 6): the peak total and the
 * month it occurs in, the largest amount at one interface, the months with condensation, and
 * whether the construction dries out within the cycle or accumulates.
 */
import type { GlaserMonthResult, GlaserResult } from './glaser-types';
import type { CycleMonths } from './glaser-cycle';

/** The figures of the year, amounts g/m². */
export interface YearlyOutcome {
	maxAccumulation: number;
	peakMonth: number | null;
	maxAtInterface: number;
	maxAtInterfaceNode: number | null;
	condensationMonths: number[];
	surfaceCondensationMonths: number[];
	outcome: GlaserResult['outcome'];
}

/**
 * The largest total held at the end of a month (g/m²) and that calendar month, the first in
 * cycle order of equal totals; 0 and null when nothing is ever held (ISO 13788:2012, clause 6).
 */
export function peakAccumulation(
	results: readonly GlaserMonthResult[],
	order: readonly number[]
): { maxAccumulation: number; peakMonth: number | null } {
	let maxAccumulation = 0;
	let peakMonth: number | null = null;
	for (const m of order) {
		if (results[m].accumulated > maxAccumulation) {
			maxAccumulation = results[m].accumulated;
			peakMonth = results[m].month;
		}
	}
	return { maxAccumulation, peakMonth };
}

/**
 * The largest amount held at one vapour node at the end of a month (g/m²) and that node, the
 * first in cycle order (then from the inside) of equal amounts; 0 and null when nothing is held
 * (for the acceptance limits, ISO 13788:2012, clause 6).
 */
export function peakAtInterface(
	results: readonly GlaserMonthResult[],
	order: readonly number[]
): { maxAtInterface: number; maxAtInterfaceNode: number | null } {
	let maxAtInterface = 0;
	let maxAtInterfaceNode: number | null = null;
	for (const m of order) {
		const held = results[m].accumulatedAt;
		for (let g = 0; g < held.length; g++) {
			if (held[g] > maxAtInterface) {
				maxAtInterface = held[g];
				maxAtInterfaceNode = g;
			}
		}
	}
	return { maxAtInterface, maxAtInterfaceNode };
}

/**
 * The calendar months, in ascending order, with condensation formed at some interface (ISO
 * 13788:2012, clause 6), and those in which pi exceeds psat at the internal surface (Pa; surface
 * condensation, which lies outside the Glaser method).
 */
export function monthsWithCondensation(cycle: CycleMonths): {
	condensationMonths: number[];
	surfaceCondensationMonths: number[];
} {
	const condensationMonths: number[] = [];
	const surfaceCondensationMonths: number[] = [];
	for (const m of cycle.order) {
		const r = cycle.results[m];
		if (cycle.formed[m]) condensationMonths.push(r.month);
		if (r.internalVapourPressure > r.saturationPressure[0]) surfaceCondensationMonths.push(r.month);
	}
	condensationMonths.sort((p, q) => p - q);
	surfaceCondensationMonths.sort((p, q) => p - q);
	return { condensationMonths, surfaceCondensationMonths };
}

/**
 * The outcome (ISO 13788:2012, clause 6): 'none' when no month condenses from dry
 * (`condensesFromDry` false), 'accumulates' when condensate is left at the end of the cycle
 * (`finalTotal`, kg/m², above zero), else 'dries' (it evaporates fully within the year).
 */
export function classifyOutcome(condensesFromDry: boolean, finalTotal: number): GlaserResult['outcome'] {
	return !condensesFromDry ? 'none' : finalTotal * 1000 > 0 ? 'accumulates' : 'dries';
}

/** The yearly figures of a cycle (ISO 13788:2012, clause 6), amounts g/m². */
export function yearlyOutcome(cycle: CycleMonths, condensesFromDry: boolean): YearlyOutcome {
	// Fields copied one by one: object spread is markedly slower here, and this runs on every keystroke.
	const peak = peakAccumulation(cycle.results, cycle.order);
	const atInterface = peakAtInterface(cycle.results, cycle.order);
	const listed = monthsWithCondensation(cycle);
	return {
		maxAccumulation: peak.maxAccumulation,
		peakMonth: peak.peakMonth,
		maxAtInterface: atInterface.maxAtInterface,
		maxAtInterfaceNode: atInterface.maxAtInterfaceNode,
		condensationMonths: listed.condensationMonths,
		surfaceCondensationMonths: listed.surfaceCondensationMonths,
		outcome: classifyOutcome(condensesFromDry, cycle.finalTotal)
	};
}
