/**
 * Checks for framed constructions entered without bridging. Insulation between studs, joists or
 * rafters is bridged by them, and the ISO 6946 combined method (upper and lower limits of the
 * resistance) makes U worse than the insulation alone would.
 */
import type { Flag } from '$lib/audit/flags';
import {
	elementFlag,
	layerFlag,
	looksLikeInsulation,
	type ElementContext,
	type LayerContext
} from './context';

// Words of a layer name that put insulation between framing members, and words that put it across,
// over or outside them instead (common practice, no source: how assessors name such layers).
const FRAMED_WORDS = /between|\bin(?: the)? (?:studs?|joists?|rafters?|frame)|stud (?:cavity|void)|infill/i;
const OVER_FRAME_WORDS = /across|over|above|under|below|outside/i;

/**
 * `framed-without-bridging`: an insulation layer whose name puts it between framing members but that
 * was entered without a bridge (ISO 6946 combined method).
 */
export function layerFramedWithoutBridging(l: LayerContext): Flag[] {
	const { layer } = l;
	if (
		!looksLikeInsulation(layer, l.rev) ||
		layer.bridge ||
		!FRAMED_WORDS.test(layer.name ?? '') ||
		OVER_FRAME_WORDS.test(layer.name ?? '')
	)
		return [];
	return [
		layerFlag(
			l,
			'framed-without-bridging',
			'high',
			`${l.at} sits between framing members but was entered without bridging; the studs, joists or rafters make U worse (ISO 6946 combined method).`
		)
	];
}

/** Whether an element is a framed construction: a roof insulated at the rafters, or a timber-frame or stud wall by its name. */
export function isFramedElement(ctx: ElementContext): boolean {
	return ctx.element.kind === 'pitched-roof-rafters' || /timber[ -]?frame|\bstud/i.test(ctx.element.name);
}

/**
 * `framed-without-bridging`: a framed element with insulation in which no layer is bridged, unless one
 * of its layers is already flagged for it among `earlier` (ISO 6946 combined method).
 */
export function elementFramedWithoutBridging(
	ctx: ElementContext,
	layers: readonly LayerContext[],
	earlier: readonly Flag[]
): Flag[] {
	const elementId = ctx.element.id;
	if (
		!isFramedElement(ctx) ||
		layers.some((l) => l.layer.bridge) ||
		!layers.some((l) => looksLikeInsulation(l.layer, l.rev)) ||
		earlier.some((f) => f.code === 'framed-without-bridging' && f.elementId === elementId)
	)
		return [];
	return [
		elementFlag(
			ctx,
			'framed-without-bridging',
			'high',
			`${ctx.at} is a framed construction but no layer is bridged; enter the framing as a bridge in the insulation layer between the members (ISO 6946 combined method).`
		)
	];
}
