/**
 * Checks of entered values against plausible ranges (see ./plausible.ts for each range and its
 * source). A value outside a range is not wrong by itself; it is a reason to look.
 */
import type { StoredLayer } from '$lib/dwellings/element-input';
import { type MaterialCategory } from '$lib/library/categories';
import type { Flag } from '$lib/audit/flags';
import {
	MAX_INSULATION_LAYER_MM,
	PLAUSIBLE_GIVEN_U,
	PLAUSIBLE_LAMBDA,
	PLAUSIBLE_TOTAL_THICKNESS_MM,
	inRange
} from '$lib/audit/plausible';
import {
	elementFlag,
	layerFlag,
	looksLikeInsulation,
	type ElementContext,
	type LayerContext
} from './context';

/**
 * `thickness-implausible` (low): a given U (of a window or door, or an element without a build-up)
 * outside PLAUSIBLE_GIVEN_U, the range from triple to single glazing (common practice, no source).
 */
export function givenUImplausible(ctx: ElementContext): Flag[] {
	const givenU = ctx.element.givenU;
	if (givenU === null || inRange(givenU, PLAUSIBLE_GIVEN_U)) return [];
	return [
		elementFlag(
			ctx,
			'thickness-implausible',
			'low',
			`${ctx.at}: a given U of ${givenU} W/(m²·K) is outside the usual ${PLAUSIBLE_GIVEN_U.min}–${PLAUSIBLE_GIVEN_U.max} for windows and doors (${PLAUSIBLE_GIVEN_U.source}).`
		)
	];
}

/**
 * `thickness-implausible`: a layer thinner than its library revision is supplied from, else thicker than
 * it is supplied up to (the revision's own range, from the product's documentation).
 */
export function thicknessOutsideSupplied(l: LayerContext): Flag[] {
	const { rev, layer } = l;
	if (!rev) return [];
	const code = rev.code ? `${rev.code} ` : '';
	if (rev.thicknessMinMm !== null && layer.thicknessMm < rev.thicknessMinMm) {
		return [
			layerFlag(
				l,
				'thickness-implausible',
				'medium',
				`${l.at} is ${layer.thicknessMm} mm; ${code}is supplied from ${rev.thicknessMinMm} mm.`
			)
		];
	}
	if (rev.thicknessMaxMm !== null && layer.thicknessMm > rev.thicknessMaxMm) {
		return [
			layerFlag(
				l,
				'thickness-implausible',
				'medium',
				`${l.at} is ${layer.thicknessMm} mm; ${code}is supplied up to ${rev.thicknessMaxMm} mm.`
			)
		];
	}
	return [];
}

/**
 * `lambda-implausible`: a layer's λ outside PLAUSIBLE_LAMBDA for its category (its revision's, else
 * insulation when its name says so); air layers have no λ to check. Each range names its source
 * (ISO 10456:2007 Table 3, from memory, or common practice, no source).
 */
export function lambdaImplausible(l: LayerContext): Flag[] {
	const { rev, layer } = l;
	const category = (rev?.category ??
		(looksLikeInsulation(layer, rev) ? 'insulation' : null)) as MaterialCategory | null;
	const range = category ? PLAUSIBLE_LAMBDA[category] : undefined;
	if (!(range && typeof layer.lambda === 'number' && !layer.air && !inRange(layer.lambda, range))) return [];
	return [
		layerFlag(
			l,
			'lambda-implausible',
			'medium',
			`${l.at}: λ = ${layer.lambda} W/(m·K) is outside ${range.min}–${range.max} W/(m·K), the plausible range for ${category} (${range.source}).`
		)
	];
}

/**
 * `thickness-implausible`: an insulation layer thicker than MAX_INSULATION_LAYER_MM, more than one layer
 * plausibly is (common practice, no source).
 */
export function insulationLayerTooThick(l: LayerContext): Flag[] {
	if (!looksLikeInsulation(l.layer, l.rev) || !(l.layer.thicknessMm > MAX_INSULATION_LAYER_MM)) return [];
	return [
		layerFlag(
			l,
			'thickness-implausible',
			'medium',
			`${l.at} is ${l.layer.thicknessMm} mm of insulation, more than the ${MAX_INSULATION_LAYER_MM} mm that is plausible in one layer (common practice, no source).`
		)
	];
}

/**
 * `thickness-implausible`: a build-up whose total thickness is outside PLAUSIBLE_TOTAL_THICKNESS_MM for
 * its kind of element (common practice, no source).
 */
export function totalThicknessImplausible(ctx: ElementContext, layers: readonly StoredLayer[]): Flag[] {
	let total = 0;
	layers.forEach((layer) => (total += layer.thicknessMm ?? 0));
	const tr = PLAUSIBLE_TOTAL_THICKNESS_MM[ctx.element.kind];
	if (!(tr && layers.length > 0 && !inRange(total, tr))) return [];
	return [
		elementFlag(
			ctx,
			'thickness-implausible',
			'medium',
			`${ctx.at} is ${Math.round(total)} mm thick in total; ${tr.min}–${tr.max} mm is plausible for this kind of element (${tr.source}).`
		)
	];
}
