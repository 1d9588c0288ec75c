// The sampled temperature field of a junction solve. Reference: a plane wall between two environments
// has a temperature linear through each layer, θ(x) = θe + (θi − θe)·(Rse + Σ d/λ up to x)/RT (steady
// one-dimensional conduction, ISO 6946's series resistances; any heat-conduction text), which bilinear
// elements reproduce exactly; and the same solve's fRsi, coldest point and L2D as analyseJunction's.
import { describe, expect, it } from 'vitest';
import { analyseJunction, type JunctionInput } from '../../src/lib/physics/junction';
import { analyseJunctionField, thinLines } from '../../src/lib/physics/junction-field';

/** Brick 100 mm (λ 0.77) outside x = 0…100, insulation 100 mm (λ 0.035) inside, 1 m high. */
const WALL: JunctionInput = {
	regions: [
		{ x0: 0, x1: 100, y0: 0, y1: 1000, lambda: 0.77 },
		{ x0: 100, x1: 200, y0: 0, y1: 1000, lambda: 0.035 }
	],
	boundaries: [
		{ from: [0, 0], to: [0, 1000], environment: 'out' },
		{ from: [200, 0], to: [200, 1000], environment: 'in' }
	],
	environments: { in: { temperature: 20, rs: 0.13 }, out: { temperature: -5, rs: 0.04 } }
};
const RT = 0.04 + 0.1 / 0.77 + 0.1 / 0.035 + 0.13;
const exact = (x: number) => {
	const r = x <= 100 ? 0.04 + x / 1000 / 0.77 : 0.04 + 0.1 / 0.77 + (x - 100) / 1000 / 0.035;
	return -5 + (25 * r) / RT;
};

describe('the sampled temperature field', () => {
	it('is the exact linear profile of a plane wall at every sample point, with the key lines kept', () => {
		const r = analyseJunctionField(WALL, { sampleField: { maxLines: 10 } });
		const f = r.field!;
		expect(f.xs).toContain(0);
		expect(f.xs).toContain(100);
		expect(f.xs).toContain(200);
		expect(f.xs.length).toBeLessThan(30);
		f.ys.forEach((_, j) =>
			f.xs.forEach((x, i) => expect(f.values[j * f.xs.length + i]!).toBeCloseTo(exact(x), 8))
		);
		expect(f.cells).toHaveLength((f.xs.length - 1) * (f.ys.length - 1));
		expect(f.cells.every((c, k) => c === (f.xs[(k % (f.xs.length - 1)) + 1] <= 100 ? 0 : 1))).toBe(true);
	});

	it('gives the same fRsi, coldest point and L2D as analyseJunction', () => {
		const a = analyseJunction(WALL);
		const b = analyseJunctionField(WALL);
		expect(b.field).toBeUndefined();
		expect(b.fRsi).toBeCloseTo(a.fRsi, 12);
		expect(b.coldest).toEqual(a.coldest);
		expect(b.couplingCoefficient).toBeCloseTo(a.couplingCoefficient, 12);
		expect(b.couplingCoefficient).toBeCloseTo(1 / RT, 6);
	});

	it('takes fRsi over the named environments only, null over none the model has', () => {
		const r = analyseJunctionField(WALL, { surfaceEnvironments: ['out'] });
		expect(r.fRsi!).toBeCloseTo((exact(0) + 5) / 25, 8);
		expect(analyseJunctionField(WALL, { surfaceEnvironments: [] }).fRsi).toBeNull();
	});

	it('samples a window and leaves points outside the material empty', () => {
		const L: JunctionInput = {
			...WALL,
			regions: [...WALL.regions, { x0: 0, x1: 50, y0: 1000, y1: 1200, lambda: 0.77 }],
			boundaries: [
				{ from: [0, 0], to: [0, 1200], environment: 'out' },
				{ from: [200, 0], to: [200, 1000], environment: 'in' },
				{ from: [50, 1000], to: [200, 1000], environment: 'in' },
				{ from: [50, 1000], to: [50, 1200], environment: 'in' }
			]
		};
		const f = analyseJunctionField(L, {
			sampleField: { window: { x0: 0, y0: 900, x1: 200, y1: 1200 } }
		}).field!;
		// the samples cover the window: the first line at or below its bottom, none further
		expect(f.ys[0]).toBeLessThanOrEqual(900);
		expect(f.ys[1]).toBeGreaterThan(900);
		const i = f.xs.indexOf(200);
		const j = f.ys.findIndex((y) => y > 1000);
		expect(f.values[j * f.xs.length + i]).toBeNull();
	});

	it('thins lines to the spacing asked, keeping every key line and both ends', () => {
		const lines = Float64Array.from({ length: 101 }, (_, i) => i);
		const kept = thinLines(lines, Int32Array.from([0, 37, 100]), 0, 100, 10);
		expect(kept).toContain(37);
		expect(kept[0]).toBe(0);
		expect(kept[kept.length - 1]).toBe(100);
		expect(kept.length).toBeLessThanOrEqual(13);
	});
});
