/**
 * A figure as the pages' tables and result cards show it: fixed decimals, and an en dash "–" where
 * there is no value (null, undefined, not finite). The PDFs write theirs with `fx` from format.ts.
 */
export function fixedOrDash(v: number | null | undefined, decimals = 2): string {
	return v === null || v === undefined || !Number.isFinite(v) ? '–' : v.toFixed(decimals);
}

/** A thickness in mm as the template pages list it: a whole number as it is, otherwise one decimal. */
export function mmShown(v: number): string {
	return Number.isInteger(v) ? String(v) : v.toFixed(1);
}
