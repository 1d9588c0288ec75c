/**
 * A dwelling's transmission heat loss with its junctions: H_T = Σ U·A + Σ ψ·L (ISO 13789, ISO 14683;
 * point thermal bridges χ are not included), in W/K. Pure: the page's summary and the service's
 * `junctionTotals` use it.
 */
import type { DimensionSystem, JunctionType, PsiSource } from './kinds';

/** A junction as lists and the heat-loss summary show it. */
export interface JunctionBrief {
	id: string;
	name: string;
	type: JunctionType;
	lengthM: number;
	source: PsiSource;
	dimensionSystem: DimensionSystem;
	/** ψ used, W/(m·K): the calculated one (chosen dimension system) or the entered one; null when not yet calculated */
	psi: number | null;
	psiSource: string | null;
	fRsi: number | null;
	/** fRsi against the climate's critical month; null without a climate or a result */
	surfacePass: boolean | null;
	engineVersion: string | null;
	version: number;
	updatedAt: string;
}

export interface JunctionTotals {
	/** Σ ψ·L over the junctions with a ψ, W/K */
	sumPsiL: number;
	/** junctions left out for want of a ψ */
	withoutPsi: number;
	/** the dimension systems the ψ-values refer to (more than one: they do not add up consistently) */
	systems: DimensionSystem[];
	count: number;
}

/** Σ ψ·L of the junctions (W/K), with those left out and the dimension systems met. */
export function sumJunctions(junctions: readonly JunctionBrief[]): JunctionTotals {
	let sumPsiL = 0;
	let withoutPsi = 0;
	const systems = new Set<DimensionSystem>();
	for (const j of junctions) {
		if (j.psi === null || !Number.isFinite(j.psi)) {
			withoutPsi++;
			continue;
		}
		sumPsiL += j.psi * j.lengthM;
		systems.add(j.dimensionSystem);
	}
	return { sumPsiL, withoutPsi, systems: [...systems], count: junctions.length };
}

/** H_T = Σ U·A + Σ ψ·L, W/K (ISO 13789); null when Σ U·A is not known. */
export function transmissionCoefficient(sumUA: number | null, totals: JunctionTotals): number | null {
	return sumUA === null || !Number.isFinite(sumUA) ? null : sumUA + totals.sumPsiL;
}
