/**
 * The little complex arithmetic the ISO 13786 heat-transfer matrices need: complex numbers as
 * `{ re, im }` (also their JSON form in results) and 2×2 complex matrices in row order.
 */

export interface Complex {
	re: number;
	im: number;
}

export const complex = (re: number, im = 0): Complex => ({ re, im });

export const add = (a: Complex, b: Complex): Complex => ({ re: a.re + b.re, im: a.im + b.im });

export const sub = (a: Complex, b: Complex): Complex => ({ re: a.re - b.re, im: a.im - b.im });

export const mul = (a: Complex, b: Complex): Complex => ({
	re: a.re * b.re - a.im * b.im,
	im: a.re * b.im + a.im * b.re
});

export const scale = (a: Complex, k: number): Complex => ({ re: a.re * k, im: a.im * k });

/** a / b, scaled so that neither |b|² nor the products overflow (Smith's method). */
export function div(a: Complex, b: Complex): Complex {
	if (Math.abs(b.re) >= Math.abs(b.im)) {
		const r = b.im / b.re;
		const d = b.re + b.im * r;
		return { re: (a.re + a.im * r) / d, im: (a.im - a.re * r) / d };
	}
	const r = b.re / b.im;
	const d = b.re * r + b.im;
	return { re: (a.re * r + a.im) / d, im: (a.im * r - a.re) / d };
}

/** |a| */
export const modulus = (a: Complex): number => Math.hypot(a.re, a.im);

/** arg a, radians in (−π, π] */
export const argument = (a: Complex): number => Math.atan2(a.im, a.re);

/** A 2×2 complex matrix [[m11, m12], [m21, m22]]. */
export interface Matrix2 {
	m11: Complex;
	m12: Complex;
	m21: Complex;
	m22: Complex;
}

/** The product a·b of two 2×2 complex matrices. */
export function matMul(a: Matrix2, b: Matrix2): Matrix2 {
	return {
		m11: add(mul(a.m11, b.m11), mul(a.m12, b.m21)),
		m12: add(mul(a.m11, b.m12), mul(a.m12, b.m22)),
		m21: add(mul(a.m21, b.m11), mul(a.m22, b.m21)),
		m22: add(mul(a.m21, b.m12), mul(a.m22, b.m22))
	};
}
