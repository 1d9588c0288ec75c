/** Checks of an element's recomputed result: could it be computed, and does it meet the limit and the moisture criteria. */
import { exceedsLimit } from '$lib/limit-tables/rules';
import type { Flag } from '$lib/audit/flags';
import type { Outcome } from '$lib/audit/types';
import { elementFlag, type ElementContext } from './context';
import { checkWindowParts } from '$lib/dwellings/window-parts';

/**
 * `recompute-failed`: an element judged by its given U (a window or door, or any element without a
 * build-up) that has no given U: there is nothing to recompute or judge (common practice, no source).
 */
export function nothingToCompute(ctx: ElementContext): Flag[] {
	if (ctx.element.givenU !== null) return [];
	return [
		elementFlag(ctx, 'recompute-failed', 'high', `${ctx.at} has neither a build-up nor a given U-value.`)
	];
}

/**
 * `recompute-failed`: today's engine refuses the element's build-up (`error` says why, field by field;
 * undefined when it calculated), so none of its numbers can be checked (common practice, no source).
 */
export function recomputeFailed(ctx: ElementContext, error: string | undefined): Flag[] {
	if (error === undefined) return [];
	return [elementFlag(ctx, 'recompute-failed', 'high', `${ctx.at} could not be recomputed: ${error}`)];
}

/**
 * `not-reproducing`: a window's or door's given U kept with its ISO 10077-1 parts, which today's
 * calculation of those parts does not give (to two decimals), or parts it cannot calculate. The rule is
 * `checkWindowParts` in `$lib/dwellings/window-parts`, the one the element's save applies.
 */
export function windowPartsDisagree(ctx: ElementContext): Flag[] {
	const el = ctx.element;
	if (!el.windowParts || (el.kind !== 'window' && el.kind !== 'door')) return [];
	const checked = checkWindowParts(el.windowParts, el.kind, el.givenU);
	if (checked.ok) return [];
	const why = checked.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
	return [
		elementFlag(
			ctx,
			'not-reproducing',
			'high',
			`${ctx.at}: the given U does not follow from the parts kept with it (ISO 10077-1): ${why}.`
		)
	];
}

const inTable = (ctx: ElementContext) => (ctx.tableName ? ` (${ctx.tableName})` : '');

/**
 * `u-over-limit`: a given U (of a window or door, or an element without a build-up) over the limit for
 * its kind in the dwelling's limit table (the table named in the message; "meets the limit" as in
 * `meetsLimit`).
 */
export function givenUOverLimit(ctx: ElementContext): Flag[] {
	const givenU = ctx.element.givenU;
	if (givenU === null || !exceedsLimit(givenU, ctx.limit)) return [];
	return [
		elementFlag(
			ctx,
			'u-over-limit',
			'high',
			`${ctx.at}: the given U = ${givenU.toFixed(2)} W/(m²·K) is over the limit of ${ctx.limit} W/(m²·K)${inTable(ctx)}.`
		)
	];
}

/**
 * `u-over-limit`: a build-up's U, as reported (rounded), over the limit for its kind in the dwelling's
 * limit table (the table named in the message; "meets the limit" as in `meetsLimit`), recomputed with
 * the revisions the assessor used.
 */
export function uOverLimit(ctx: ElementContext, used: Outcome): Flag[] {
	if (!exceedsLimit(used.uRounded, ctx.limit)) return [];
	return [
		elementFlag(
			ctx,
			'u-over-limit',
			'high',
			`${ctx.at}: U = ${used.uRounded.toFixed(2)} W/(m²·K) is over the limit of ${ctx.limit} W/(m²·K)${inTable(ctx)}.`
		)
	];
}

/**
 * `condensation-accumulates`: interstitial condensation that builds up over the year instead of
 * evaporating, by the Glaser method of ISO 13788 as the engine computes it.
 */
export function condensationAccumulates(ctx: ElementContext, used: Outcome): Flag[] {
	if (used.condensation !== 'accumulates') return [];
	return [
		elementFlag(
			ctx,
			'condensation-accumulates',
			'high',
			`${ctx.at}: interstitial condensation builds up over the year and does not dry out (Glaser method, ISO 13788).`
		)
	];
}

/**
 * `surface-mould-risk`: an internal surface temperature factor fRsi below the fRsi,min that avoids
 * surface mould in the critical month (ISO 13788, as the engine computes it).
 */
export function surfaceMouldRisk(ctx: ElementContext, used: Outcome): Flag[] {
	if (used.surfacePass !== false) return [];
	return [
		elementFlag(
			ctx,
			'surface-mould-risk',
			'high',
			`${ctx.at}: the temperature factor fRsi = ${used.fRsi?.toFixed(3)} is below the ${used.fRsiMin?.toFixed(3)} needed to avoid surface mould (ISO 13788).`
		)
	];
}
