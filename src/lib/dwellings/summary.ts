/**
 * Pure helpers for a dwelling's fabric: pass/fail of each element against its limit (meetsLimit) and the totals
 * ΣU·A (fabric heat-loss coefficient, W/K) and the area-weighted mean U (W/(m²·K)).
 */
import type { ElementKind } from '$lib/dwellings/kinds';
import type { HeatFlow } from '$lib/physics';
import { meetsLimit } from '$lib/limit-tables/rules';

export type ElementBrief = {
	id: string;
	position: number;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: HeatFlow;
	/** W/(m²·K): the calculated value (unrounded) or the given one for windows and doors */
	uValue: number | null;
	uValueRounded: number | null;
	given: boolean;
	moisture: 'none' | 'dries' | 'accumulates' | null;
	surfacePass: boolean | null;
	engineVersion: string | null;
	version: number;
	updatedAt: string;
};

export type ElementSummaryRow = ElementBrief & {
	/** maximum U for the kind from the limit table, W/(m²·K) */
	limit: number | null;
	/** null when there is no limit or no U */
	pass: boolean | null;
	/** U·A, W/K */
	ua: number | null;
};

export function summariseElements(
	elements: ElementBrief[],
	limits: Partial<Record<ElementKind, number>> | null
): {
	rows: ElementSummaryRow[];
	totals: {
		area: number;
		sumUA: number;
		meanU: number | null;
		failing: number;
		withoutResult: number;
		moistureRisk: number;
	};
} {
	let area = 0;
	let sumUA = 0;
	let uArea = 0;
	let failing = 0;
	let withoutResult = 0;
	let moistureRisk = 0;
	const rows = elements.map((e) => {
		const limit = limits?.[e.kind] ?? null;
		const pass = meetsLimit(e.uValueRounded, limit);
		const ua = e.uValue === null ? null : e.uValue * e.area;
		area += e.area;
		if (ua === null) withoutResult++;
		else {
			sumUA += ua;
			uArea += e.area;
		}
		if (pass === false) failing++;
		if (e.moisture === 'accumulates' || e.surfacePass === false) moistureRisk++;
		return { ...e, limit, pass, ua };
	});
	return {
		rows,
		totals: { area, sumUA, meanU: uArea > 0 ? sumUA / uArea : null, failing, withoutResult, moistureRisk }
	};
}
