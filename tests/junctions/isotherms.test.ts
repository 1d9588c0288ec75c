// Isotherms by marching squares: a field linear in x has straight isotherms at x = (level − a)/b
// (linear interpolation is exact for it); a saddle is split by the value at the cell centre (the
// usual asymptotic-decider-free rule of marching squares, common practice, no source).
import { describe, expect, it } from 'vitest';
import { isotherm, isothermLevels } from '../../src/lib/junctions/isotherms';

describe('isotherms', () => {
	it('are straight lines where a linear field crosses the level', () => {
		const xs = [0, 10, 25, 40];
		const ys = [0, 5, 20];
		const values = ys.flatMap(() => xs.map((x) => 2 + 0.5 * x));
		const cells = Array(6).fill(0);
		const segs = isotherm({ xs, ys, values, cells }, 12);
		expect(segs).toHaveLength(2);
		for (const [x0, , x1] of segs) {
			expect(x0).toBeCloseTo(20, 12);
			expect(x1).toBeCloseTo(20, 12);
		}
	});
	it('skip cells outside the material and corners without a value', () => {
		const field = { xs: [0, 1, 2], ys: [0, 1], values: [0, 1, null, 0, 1, 2], cells: [-1, 0] };
		expect(isotherm(field, 0.5)).toEqual([]);
	});
	it('split a saddle by its centre value', () => {
		const field = { xs: [0, 1], ys: [0, 1], values: [1, 0, 0, 1], cells: [0] };
		expect(isotherm(field, 0.5)).toHaveLength(2);
	});
	it('choose round levels', () => {
		expect(isothermLevels(-3, 20, 8)).toEqual([0, 5, 10, 15]);
		expect(isothermLevels(2.3, 2.9, 5)).toEqual([2.4, 2.6, 2.8]);
		expect(isothermLevels(1, 1)).toEqual([]);
	});
});
