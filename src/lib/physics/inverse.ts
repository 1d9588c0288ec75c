/**
 * Inverse U-value problem: the thickness of one layer that reaches a target U.
 */
import { ElementInputError, assertElementInput, type ElementInput } from './schema';
import { buildThermalModel } from './element';

/** Largest thickness the search will consider, mm. */
const MAX_THICKNESS_MM = 10000;

export interface ThicknessSolution {
	/** exact thickness, mm (0 when the other layers already reach the target) */
	exactMm: number;
	/** U-value at the exact thickness, W/(m²·K) */
	uAtExact: number;
	/** next product thickness at or above the exact one, mm; null without a list or above its largest size */
	roundedMm: number | null;
	/** U-value at the product thickness, W/(m²·K) */
	uAtRounded: number | null;
	/** how the thickness was found */
	method: 'closed-form' | 'bisection';
	notes: string[];
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

/**
 * As {@link solveThickness}, and rounds up to the next size of `productThicknessesMm` (mm) when given.
 */
export function solveThicknessDetailed(
	raw: ElementInput,
	layerIndex: number,
	targetU: number,
	productThicknessesMm?: readonly number[]
): ThicknessSolution {
	const input = assertElementInput(raw);
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
	if (productThicknessesMm) {
		productThicknessesMm.forEach((t, i) => {
			if (!(Number.isFinite(t) && t > 0))
				fail(`productThicknessesMm.${i}`, `must be a finite number > 0, got ${t}`);
		});
	}

	const uAt = (d: number) => buildThermalModel(input, { index: layerIndex, thicknessMm: d }).u;
	const base = buildThermalModel(input);
	if (layerIndex >= base.active)
		fail(`${path}.thicknessMm`, 'the layer lies outside a well-ventilated air layer and does not count in U');

	const notes: string[] = [];
	let exact: number;
	let method: ThicknessSolution['method'];
	const plain =
		!input.ground && // ISO 13370: U is not linear in RT
		!layer.bridge &&
		base.deltaU === 0 &&
		!input.layers.some((l, i) => l.air === 'slightly-ventilated' && i < base.active && i < layerIndex);
	if (plain) {
		// RT is linear in the layer's resistance: RT = R_rest + d/λ.
		method = 'closed-form';
		const rRest = base.rTotal - base.layers[layerIndex].r;
		const rNeeded = 1 / targetU - rRest;
		exact = rNeeded <= 0 ? 0 : rNeeded * (layer.lambda as number) * 1000;
		if (exact > MAX_THICKNESS_MM)
			fail('targetU', `needs ${exact.toFixed(0)} mm, more than ${MAX_THICKNESS_MM} mm`);
	} else {
		method = 'bisection';
		if (uAt(0) <= targetU) {
			exact = 0;
		} else {
			let hi = Math.max(layer.thicknessMm, 1);
			while (uAt(hi) > targetU) {
				hi *= 2;
				if (hi > MAX_THICKNESS_MM)
					fail(
						'targetU',
						`is not reached by thickening layer ${layerIndex + 1} up to ${MAX_THICKNESS_MM} mm`
					);
			}
			let lo = 0;
			for (let it = 0; it < 200 && hi - lo > 1e-9; it++) {
				const mid = 0.5 * (lo + hi);
				if (uAt(mid) > targetU) lo = mid;
				else hi = mid;
			}
			exact = hi;
		}
	}
	if (exact === 0) notes.push('The other layers already reach the target U.');

	let roundedMm: number | null = null;
	let uAtRounded: number | null = null;
	if (productThicknessesMm && productThicknessesMm.length) {
		const sizes = [...productThicknessesMm].sort((a, b) => a - b);
		const next = sizes.find((t) => t >= exact - 1e-9);
		if (next === undefined)
			notes.push(
				`No product thickness reaches ${exact.toFixed(1)} mm; the largest is ${sizes[sizes.length - 1]} mm.`
			);
		else {
			roundedMm = next;
			uAtRounded = uAt(next);
		}
	}
	return { exactMm: exact, uAtExact: uAt(exact), roundedMm, uAtRounded, method, notes };
}
