/**
 * Inverse U-value problem: the thickness of one layer that reaches a target U, and whether the layer
 * as entered already reaches it.
 */
import { ElementInputError, assertElementInput, type ElementInput } from './schema';
import { buildThermalModel } from './element';
import { DEFAULT_U_ROUNDING, roundValue } from './rounding';

/** Largest thickness the search will consider, mm. */
const MAX_THICKNESS_MM = 10000;

/**
 * Room for binary floating point when a reported U is compared with a target, W/(m²·K): a U reported
 * as 0.16 meets a target of 0.16 (common practice, no source; the limit check's own tolerance).
 */
const TARGET_TOLERANCE = 1e-9;

/**
 * What the solve found:
 * - `thicker`: the layer as entered does not reach the target; `roundedMm` is the next product size
 *   at or above the exact thickness (null without a list, or above its largest size);
 * - `meets`: the layer as entered already reaches the target; nothing is proposed (a thinner layer
 *   is offered only when asked for, `mode: 'thinnest'`);
 * - `thinner` (asked for): `roundedMm` is the thinnest product size that still reaches the target,
 *   thinner than entered (null without a list: then `exactMm` is the thinnest);
 * - `thinnest` (asked for): no product size thinner than the layer as entered reaches the target.
 */
export type ThicknessOutcome = 'thicker' | 'meets' | 'thinner' | 'thinnest';

export interface ThicknessSolution {
	outcome: ThicknessOutcome;
	/** the layer's thickness as entered, mm */
	currentMm: number;
	/** U-value with the layer as entered, W/(m²·K), unrounded and as reported (the element's rounding) */
	uCurrent: number;
	uCurrentRounded: number;
	/** exact thickness at which U equals the target, mm (0 when the other layers already reach it) */
	exactMm: number;
	/** U-value at the exact thickness, W/(m²·K) */
	uAtExact: number;
	/** the proposed product thickness, mm (see {@link ThicknessOutcome}); null when nothing is proposed */
	roundedMm: number | null;
	/** U-value at the proposed thickness, W/(m²·K) */
	uAtRounded: number | null;
	/** how the thickness was found */
	method: 'closed-form' | 'bisection';
	notes: string[];
}

export interface ThicknessOptions {
	/**
	 * `meet` (default): the thickness the layer needs, and nothing when it already reaches the target;
	 * `thinnest`: also the thinnest product size that still reaches it when the layer is thicker.
	 */
	mode?: 'meet' | 'thinnest';
}

const fail = (path: string, message: string): never => {
	throw new ElementInputError([{ path, message }]);
};

/**
 * Thickness in mm of layer `layerIndex` at which the element's U-value (ISO 6946, with the ΔU
 * rule as in {@link analyseElement}) equals `targetU` in W/(m²·K); exact: in closed form
 * d = λ·(1/U − (RT − R_layer)) for a plain homogeneous layer, otherwise by bisection to 10⁻⁹ mm.
 * Throws when the layer has no λ, is an air layer or is disregarded, or when the target cannot be reached.
 */
export function solveThickness(input: ElementInput, layerIndex: number, targetU: number): number {
	return solveThicknessDetailed(input, layerIndex, targetU).exactMm;
}

/** Refuses a layer whose thickness cannot be solved for, and bad targets or product sizes, naming the field. */
function checkRequest(
	input: ElementInput,
	layerIndex: number,
	targetU: number,
	sizes: readonly number[] | undefined
): void {
	if (!Number.isInteger(layerIndex) || layerIndex < 0 || layerIndex >= input.layers.length) {
		fail('layerIndex', `must be a layer index from 0 to ${input.layers.length - 1}, got ${layerIndex}`);
	}
	if (!(Number.isFinite(targetU) && targetU > 0))
		fail('targetU', `must be a finite number > 0, got ${targetU}`);
	const layer = input.layers[layerIndex];
	const path = `layers.${layerIndex}`;
	if (layer.air)
		fail(
			`${path}.air`,
			'the thickness of an air layer cannot be solved for (its resistance comes from a table)'
		);
	if (layer.lambda === undefined)
		fail(`${path}.lambda`, 'the layer needs λ for its thickness to be solved for');
	sizes?.forEach((t, i) => {
		if (!(Number.isFinite(t) && t > 0))
			fail(`productThicknessesMm.${i}`, `must be a finite number > 0, got ${t}`);
	});
}

/**
 * Exact thickness (mm) of layer `i` for `targetU` (W/(m²·K)): closed form where RT is linear in the
 * layer's resistance (no ground, bridge, ΔU or slightly ventilated layer inside it), else bisection.
 */
function exactThickness(
	input: ElementInput,
	i: number,
	targetU: number,
	uAt: (d: number) => number
): { exact: number; method: ThicknessSolution['method'] } {
	const layer = input.layers[i];
	const base = buildThermalModel(input);
	if (i >= base.active)
		fail(
			`layers.${i}.thicknessMm`,
			'the layer lies outside a well-ventilated air layer and does not count in U'
		);
	const plain =
		!input.ground && // ISO 13370: U is not linear in RT
		!layer.bridge &&
		base.deltaU === 0 &&
		!input.layers.some((l, j) => l.air === 'slightly-ventilated' && j < base.active && j < i);
	if (plain) {
		// RT is linear in the layer's resistance: RT = R_rest + d/λ.
		const rNeeded = 1 / targetU - (base.rTotal - base.layers[i].r);
		const exact = rNeeded <= 0 ? 0 : rNeeded * (layer.lambda as number) * 1000;
		if (exact > MAX_THICKNESS_MM)
			fail('targetU', `needs ${exact.toFixed(0)} mm, more than ${MAX_THICKNESS_MM} mm`);
		return { exact, method: 'closed-form' };
	}
	if (uAt(0) <= targetU) return { exact: 0, method: 'bisection' };
	let hi = Math.max(layer.thicknessMm, 1);
	while (uAt(hi) > targetU) {
		hi *= 2;
		if (hi > MAX_THICKNESS_MM)
			fail('targetU', `is not reached by thickening layer ${i + 1} up to ${MAX_THICKNESS_MM} mm`);
	}
	let lo = 0;
	for (let it = 0; it < 200 && hi - lo > 1e-9; it++) {
		const mid = 0.5 * (lo + hi);
		if (uAt(mid) > targetU) lo = mid;
		else hi = mid;
	}
	return { exact: hi, method: 'bisection' };
}

/**
 * The thickness of layer `layerIndex` for a target U, as {@link solveThickness}, and whether the
 * layer as entered already reaches it: judged on U as reported (the element's rounding, default two
 * decimals), the way a limit is checked. When it does not, the next size of
 * `productThicknessesMm` at or above the exact thickness is proposed. When it does, nothing is
 * proposed (`meets`) unless `mode: 'thinnest'` asks for the thinnest product size that still reaches
 * the target by its unrounded U (`thinner`, or `thinnest` when no size below the entered one does).
 */
export function solveThicknessDetailed(
	raw: ElementInput,
	layerIndex: number,
	targetU: number,
	productThicknessesMm?: readonly number[],
	options: ThicknessOptions = {}
): ThicknessSolution {
	const input = assertElementInput(raw);
	checkRequest(input, layerIndex, targetU, productThicknessesMm);
	const uAt = (d: number) => buildThermalModel(input, { index: layerIndex, thicknessMm: d }).u;
	const { exact, method } = exactThickness(input, layerIndex, targetU, uAt);
	const currentMm = input.layers[layerIndex].thicknessMm;
	const uCurrent = uAt(currentMm);
	const uCurrentRounded = roundValue(uCurrent, input.rounding ?? DEFAULT_U_ROUNDING);
	const meets = uCurrentRounded <= targetU + TARGET_TOLERANCE;

	const notes: string[] = [];
	if (exact === 0) notes.push('The other layers already reach the target U.');
	const sizes = productThicknessesMm?.length ? [...productThicknessesMm].sort((a, b) => a - b) : null;
	const next = sizes?.find((t) => t >= exact - 1e-9);
	let outcome: ThicknessOutcome;
	let roundedMm: number | null = null;
	if (!meets) {
		outcome = 'thicker';
		if (next !== undefined) roundedMm = next;
		else if (sizes)
			notes.push(
				`No product thickness reaches ${exact.toFixed(1)} mm; the largest is ${sizes[sizes.length - 1]} mm.`
			);
	} else {
		const thinnest = sizes ? next : exact;
		const thinner = thinnest !== undefined && thinnest < currentMm - 1e-9;
		outcome = options.mode !== 'thinnest' ? 'meets' : thinner ? 'thinner' : 'thinnest';
		if (outcome === 'thinner' && sizes) roundedMm = thinnest as number;
		notes.push(
			`Layer ${layerIndex + 1} as entered (${currentMm} mm) already reaches the target U = ${targetU} W/(m²·K): U = ${uCurrentRounded} W/(m²·K).`
		);
	}
	return {
		outcome,
		currentMm,
		uCurrent,
		uCurrentRounded,
		exactMm: exact,
		uAtExact: uAt(exact),
		roundedMm,
		uAtRounded: roundedMm === null ? null : uAt(roundedMm),
		method,
		notes
	};
}
