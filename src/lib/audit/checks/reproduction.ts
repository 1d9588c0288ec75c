/** Checks of the issued numbers: do they reproduce, and would the library's current revisions change them. */
import type { Flag } from '$lib/audit/flags';
import type { Outcome } from '$lib/audit/types';
import { U_TOLERANCE } from '$lib/audit/plausible';
import { failure } from '$lib/audit/element-recompute';
import { elementFlag, fmtU, type ElementContext } from './context';

/**
 * `not-reproducing`: the engine input stored with the report no longer calculates (`reproduced.error`
 * is what the engine threw), so the issued numbers cannot be reproduced (common practice, no source).
 */
export function issuedInputFails(
	ctx: ElementContext,
	reproduced: { outcome: Outcome | null } | { error: unknown }
): Flag[] {
	if (!('error' in reproduced)) return [];
	return [
		elementFlag(
			ctx,
			'not-reproducing',
			'high',
			`${ctx.at}: the input stored with report ${ctx.report!.number} no longer calculates: ${failure(reproduced.error)}`
		)
	];
}

/**
 * `not-reproducing`: the issued U differs by more than U_TOLERANCE from the one recomputed with the
 * revisions the report used; else, the issued interstitial condensation outcome differs from the
 * recomputed one. One flag at most (tolerance: common practice, no source).
 */
export function issuedNumbersDiffer(
	ctx: ElementContext,
	issued: Outcome | null,
	reproduced: Outcome | null
): Flag[] {
	if (!issued || !reproduced) return [];
	const du = reproduced.u - issued.u;
	if (Math.abs(du) > U_TOLERANCE) {
		return [
			elementFlag(
				ctx,
				'not-reproducing',
				'high',
				`${ctx.at}: report ${ctx.report!.number} gives U = ${fmtU(issued.u)}; recomputed with the revisions it used, U = ${fmtU(reproduced.u)} W/(m²·K) (difference ${du > 0 ? '+' : ''}${du.toFixed(3)}).`
			)
		];
	}
	if (issued.condensation && reproduced.condensation && issued.condensation !== reproduced.condensation) {
		return [
			elementFlag(
				ctx,
				'not-reproducing',
				'high',
				`${ctx.at}: report ${ctx.report!.number} says the interstitial condensation outcome is "${issued.condensation}"; recomputed it is "${reproduced.condensation}".`
			)
		];
	}
	return [];
}

/**
 * `library-changed`: with the library's current revisions the U would differ by more than U_TOLERANCE
 * from the issued one, and some layer's revision has been replaced (`replaced`). Informative: the
 * assessor used what was current then (common practice, no source).
 */
export function libraryChanged(
	ctx: ElementContext,
	issued: Outcome | null,
	current: Outcome | null,
	replaced: boolean
): Flag[] {
	if (!issued || !current || !(Math.abs(current.u - issued.u) > U_TOLERANCE) || !replaced) return [];
	return [
		elementFlag(
			ctx,
			'library-changed',
			'low',
			`${ctx.at}: with the library's current revisions U would be ${fmtU(current.u)} instead of the issued ${fmtU(issued.u)} W/(m²·K).`
		)
	];
}
