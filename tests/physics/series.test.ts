// The finite-element kernel against a dense solve from a general-purpose linear-algebra package
// (ml-matrix, LU) and against the closed-form series sum (resistances in series: common practice,
// no source needed — ISO 6946:2017 6.7.1 sums layer resistances this way).
import { describe, expect, it } from 'vitest';
import { createSeriesWork, DELTA_0, solveSeries } from '../../src/lib/physics';
import { closedFormSeries, denseSeries, lcg } from './helpers';

describe('solveSeries (Thomas algorithm on the assembled tridiagonal system)', () => {
	it('one element: both nodes fixed, flux = g·ΔT', () => {
		const out = new Float64Array(2);
		const q = solveSeries([1 / 0.5], 0, 1, 20, 0, out);
		expect(q).toBeCloseTo(40, 12);
		expect(Array.from(out)).toEqual([20, 0]);
	});

	it('matches a dense ml-matrix solve of the same assembled system on 25 random chains', () => {
		const rnd = lcg(2024);
		const work = createSeriesWork(64);
		for (let trial = 0; trial < 25; trial++) {
			const n = 2 + Math.floor(rnd() * 40);
			const g = Array.from({ length: n }, () => 10 ** (rnd() * 5 - 2)); // 0.01 … 1000 W/(m²·K)
			const left = 40 * rnd() - 10;
			const right = -30 * rnd();
			const out = new Float64Array(n + 1);
			const q = solveSeries(g, 0, n, left, right, out, work);
			const ref = denseSeries(g, left, right);
			for (let i = 0; i <= n; i++) expect(Math.abs(out[i] - ref[i])).toBeLessThan(1e-9);
			// flux through every element is the same (conservation)
			for (let e = 0; e < n; e++) expect(g[e] * (out[e] - out[e + 1])).toBeCloseTo(q, 8);
		}
	});

	it('matches the closed-form series sum for a wall build-up', () => {
		// Rsi 0.13, plaster 0.02, block 0.9, insulation 3.0, brick 0.13, Rse 0.04 (m²·K/W)
		const r = [0.13, 0.02, 0.9, 3.0, 0.13, 0.04];
		const out = new Float64Array(r.length + 1);
		const q = solveSeries(
			r.map((x) => 1 / x),
			0,
			r.length,
			20,
			-5,
			out
		);
		const ref = closedFormSeries(r, 20, -5);
		expect(q).toBeCloseTo(ref.flux, 12);
		ref.values.forEach((v, i) => expect(out[i]).toBeCloseTo(v, 10));
	});

	it('solves a sub-range of a longer chain and leaves the rest untouched', () => {
		const g = [1, 2, 3, 4, 5];
		const out = new Float64Array(6).fill(-99);
		solveSeries(g, 1, 4, 10, 0, out);
		expect(out[0]).toBe(-99);
		expect(out[5]).toBe(-99);
		const ref = denseSeries([2, 3, 4], 10, 0);
		for (let i = 0; i < 4; i++) expect(out[i + 1]).toBeCloseTo(ref[i], 12);
	});

	it('merges zero-resistance elements (g = ∞): both nodes take one value, the rest is exact', () => {
		// Rsi 0.13 | membrane R = 0 | insulation 2.5 | Rse 0.04
		const g = [1 / 0.13, Infinity, 1 / 2.5, 1 / 0.04];
		const out = new Float64Array(5);
		const q = solveSeries(g, 0, 4, 20, 0, out);
		const ref = closedFormSeries([0.13, 0, 2.5, 0.04], 20, 0);
		expect(out[1]).toBe(out[2]);
		ref.values.forEach((v, i) => expect(out[i]).toBeCloseTo(v, 12));
		expect(q).toBeCloseTo(ref.flux, 12);
		// A dense solve with a very stiff element approaches the merged answer.
		const stiff = denseSeries([1 / 0.13, 1e9, 1 / 2.5, 1 / 0.04], 20, 0);
		stiff.forEach((v, i) => expect(out[i]).toBeCloseTo(v, 6));
	});

	it('merges any pattern of zero-resistance elements exactly (random chains against a dense solve of the merged system)', () => {
		const rnd = lcg(77);
		for (let trial = 0; trial < 300; trial++) {
			const n = 1 + Math.floor(rnd() * 14);
			const g = Array.from({ length: n }, () => (rnd() < 0.3 ? Infinity : 10 ** (rnd() * 4 - 1)));
			const finite = g.filter((x) => x !== Infinity);
			const left = 20;
			const right = finite.length ? -5 : 20; // an all-zero-resistance chain needs equal ends
			const out = new Array<number>(n + 1).fill(0);
			const q = solveSeries(g, 0, n, left, right, out);
			// reference: dense solve of the chain without the zero-resistance elements, mapped back
			const merged = finite.length ? denseSeries(finite, left, right) : [left];
			let k = 0;
			const expected = [left];
			for (let e = 0; e < n; e++) {
				if (g[e] !== Infinity) k++;
				expected.push(merged[k]);
			}
			for (let i = 0; i <= n; i++) expect(Math.abs(out[i] - expected[i])).toBeLessThan(1e-9);
			const total = finite.reduce((a, x) => a + 1 / x, 0);
			expect(q).toBeCloseTo(finite.length ? (left - right) / total : 0, 8);
		}
	});

	it('splitting an element into equal sub-elements interpolates linearly and keeps the flux', () => {
		const whole = new Float64Array(3);
		const q1 = solveSeries([1 / 0.13, 1 / 4], 0, 2, 20, 0, whole);
		const split = new Float64Array(6);
		const q2 = solveSeries([1 / 0.13, 1, 1, 1, 1], 0, 5, 20, 0, split); // 4 × R 1.0
		expect(q2).toBeCloseTo(q1, 12);
		for (let k = 0; k <= 4; k++)
			expect(split[1 + k]).toBeCloseTo(whole[1] + ((whole[2] - whole[1]) * k) / 4, 12);
	});

	it('vapour: g = δ0/sd gives flux δ0·Δp/Σsd (ISO 13788:2012 clause 6, δ0 = 2e-10 from memory)', () => {
		const sd = [0.1, 10, 0.5];
		const out = new Float64Array(4);
		const flux = solveSeries(
			sd.map((s) => DELTA_0 / s),
			0,
			3,
			1168.48,
			488.4,
			out
		);
		expect(flux).toBeCloseTo((2e-10 * (1168.48 - 488.4)) / 10.6, 20);
		expect(out[1]).toBeCloseTo(1168.48 - (flux * 0.1) / 2e-10, 8);
	});

	it('refuses a non-positive conductance and a chain of zero total resistance', () => {
		const out = new Float64Array(3);
		expect(() => solveSeries([1, 0], 0, 2, 1, 0, out)).toThrow(/conductance must be > 0/);
		expect(() => solveSeries([1, Number.NaN], 0, 2, 1, 0, out)).toThrow(/conductance/);
		expect(() => solveSeries([Infinity, Infinity], 0, 2, 1, 0, out)).toThrow(/zero total resistance/);
	});
});
