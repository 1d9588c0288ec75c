// The two-dimensional junction solve against an independent implementation: vertex-centred finite
// volumes (the five-point scheme) in Python/numpy, tests/physics/reference/junction_fd.py, which
// shares no code with the engine (different discretisation, different solver). It solves an
// insulated external corner on uniform grids of 20, 10 and 5 mm; the limit is estimated by
// Richardson extrapolation with the observed order (the corner makes the order below two). The
// engine must agree with that limit within its own discretisation tolerance.
import { spawnSync } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { analyseJunction, type JunctionInput } from '../../src/lib/physics/junction';

const script = fileURLToPath(new URL('./reference/junction_fd.py', import.meta.url));
const probe = spawnSync('python3', ['-c', 'import numpy; print(numpy.__version__)'], { encoding: 'utf8' });
const python = probe.status === 0 ? probe.stdout.trim() : null;

type Pt = [number, number];
const P = (x: number, y: number): Pt => [x, y];

// An external corner: 200 mm masonry (λ 0.9) inside 100 mm insulation (λ 0.04), legs 1000 mm
// outside, Rsi 0.13 and Rse 0.04 (invented demo geometry; ISO 6946 surface resistances, from memory).
const corner: JunctionInput = {
	regions: [
		{ name: 'masonry along x', x0: 0, y0: 0, x1: 1000, y1: 300, lambda: 0.9 },
		{ name: 'masonry along y', x0: 0, y0: 0, x1: 300, y1: 1000, lambda: 0.9 },
		{ name: 'insulation along x', x0: 0, y0: 0, x1: 1000, y1: 100, lambda: 0.04 },
		{ name: 'insulation along y', x0: 0, y0: 0, x1: 100, y1: 1000, lambda: 0.04 }
	],
	boundaries: [
		{ from: P(0, 0), to: P(1000, 0), environment: 'out' },
		{ from: P(0, 0), to: P(0, 1000), environment: 'out' },
		{ from: P(300, 300), to: P(1000, 300), environment: 'in' },
		{ from: P(300, 300), to: P(300, 1000), environment: 'in' }
	],
	environments: { in: { temperature: 20, rs: 0.13 }, out: { temperature: 0, rs: 0.04 } }
};
const points: Pt[] = [P(300, 300), P(200, 200), P(600, 200), P(100, 700)];

interface Reference {
	numpy: string;
	results: {
		spacing: number;
		couplingCoefficient: number;
		heatFlows: Record<string, number>;
		points: number[];
	}[];
}

/** Richardson extrapolation of three values on grids h, h/2, h/4 with the observed order. */
function extrapolate(v: number[]): { limit: number; order: number } {
	const [a, b, c] = v;
	const ratio = (a - b) / (b - c);
	return { limit: c - (b - c) / (ratio - 1), order: Math.log2(ratio) };
}

describe.skipIf(!python)(
	`independent finite-volume reference in Python/numpy (${python ? `numpy ${python}` : 'python3 with numpy not found: skipped'})`,
	() => {
		const run = () => {
			const out = spawnSync('python3', [script], {
				input: JSON.stringify({ ...corner, points, spacings: [20, 10, 5] }),
				encoding: 'utf8',
				maxBuffer: 1 << 24,
				timeout: 120000
			});
			if (out.status !== 0) throw new Error(`junction_fd.py failed: ${out.stderr}`);
			return JSON.parse(out.stdout) as Reference;
		};
		let ref: Reference | null = null;
		const reference = () => (ref ??= run());

		it('agrees on L2D with the extrapolated finite-volume limit', () => {
			const fv = extrapolate(reference().results.map((r) => r.couplingCoefficient));
			expect(fv.order).toBeGreaterThan(1);
			expect(fv.order).toBeLessThan(2.5);
			const ours = analyseJunction(corner);
			// the engine's own last halving changed L2D by `refinementChange` (≤ 1 %); its error is of that size or less
			expect(Math.abs(ours.couplingCoefficient / fv.limit - 1)).toBeLessThan(
				Math.max(5e-4, ours.mesh.refinementChange)
			);
			const fine = analyseJunction({ ...corner, maxCellMm: 20 });
			expect(Math.abs(fine.couplingCoefficient / fv.limit - 1)).toBeLessThan(1e-4);
		}, 120000);

		it('agrees on temperatures, the inner corner’s (the coldest point) among them', () => {
			const results = reference().results;
			const ours = analyseJunction({ ...corner, probes: points, maxCellMm: 20 });
			points.forEach((_, k) => {
				const fv = extrapolate(results.map((r) => r.points[k]));
				expect(Math.abs(ours.probes![k] - fv.limit)).toBeLessThan(0.003);
			});
			expect(ours.coldest).toMatchObject({ x: 300, y: 300 });
			expect(
				Math.abs(ours.coldest.temperature - extrapolate(results.map((r) => r.points[0])).limit)
			).toBeLessThan(0.003);
		}, 120000);

		it('has heat flows that balance in both implementations', () => {
			for (const r of reference().results)
				expect(Math.abs(r.heatFlows.in + r.heatFlows.out) / r.heatFlows.in).toBeLessThan(1e-8);
			const ours = analyseJunction(corner);
			expect(Math.abs(ours.heatFlows.in + ours.heatFlows.out) / ours.heatFlows.in).toBeLessThan(1e-8);
		}, 120000);
	}
);
