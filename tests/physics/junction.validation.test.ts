// Input refusals, bounds and robustness of the two-dimensional junction calculation. The bounds
// (±20 m, λ 10⁻³…10⁴, 200 regions, the node cap …) are this product's own choices
// (src/lib/physics/junction-bounds.ts), not numbers of a standard; the tests name them as such.
// Physical expectations are facts of steady conduction (common practice, no source): with no heat
// sources every temperature lies between the coldest and the warmest environment, and the heat
// flows from all environments sum to zero.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	analyseJunction,
	JunctionInputError,
	parseJunctionInput,
	type JunctionInput,
	type JunctionResult
} from '../../src/lib/physics/junction';
import { JUNCTION_NODES_MAX } from '../../src/lib/physics/junction-bounds';
import { firstNonFinite } from './helpers';

type Pt = [number, number];
const P = (x: number, y: number): Pt => [x, y];

/** A brick wall with external insulation (invented demo input). */
const wall = (): JunctionInput => ({
	regions: [
		{ name: 'brick', x0: 0, y0: 0, x1: 300, y1: 1000, lambda: 0.8 },
		{ name: 'insulation', x0: 300, y0: 0, x1: 400, y1: 1000, lambda: 0.035 }
	],
	boundaries: [
		{ from: P(0, 0), to: P(0, 1000), environment: 'in' },
		{ from: P(400, 0), to: P(400, 1000), environment: 'out' }
	],
	environments: { in: { temperature: 20, rs: 0.13 }, out: { temperature: 0, rs: 0.04 } }
});

type Raw = Record<string, unknown> & {
	regions: Record<string, unknown>[];
	boundaries: Record<string, unknown>[];
};
const issuesOf = (change: (w: Raw) => void) => {
	const w = structuredClone(wall()) as unknown as Raw;
	change(w);
	const r = parseJunctionInput(w);
	return r.ok ? [] : r.issues;
};

describe('refusals name the item and the field, and say why', () => {
	const cases: [string, (w: Raw) => void, string, RegExp][] = [
		[
			'λ of zero',
			(w) => (w.regions[1].lambda = 0),
			'regions.1.lambda',
			/^Region 2 \(“insulation”\): λ must be greater than 0$/
		],
		[
			'λ as text',
			(w) => (w.regions[0].lambda = 'abc'),
			'regions.0.lambda',
			/^Region 1 \(“brick”\): λ must be a finite number, got the text "abc"$/
		],
		['λ NaN', (w) => (w.regions[0].lambda = NaN), 'regions.0.lambda', /must be a finite number, got NaN/],
		[
			'λ infinite',
			(w) => (w.regions[0].lambda = Infinity),
			'regions.0.lambda',
			/must be a finite number, got Infinity/
		],
		[
			'λ above the bound',
			(w) => (w.regions[0].lambda = 1e5),
			'regions.0.lambda',
			/λ must be at most 10000 W\/\(m·K\)/
		],
		[
			'x1 before x0',
			(w) => (w.regions[0].x1 = -5),
			'regions.0.x1',
			/x1 must be at least 0.001 mm greater than x0/
		],
		['a coordinate beyond 20 m', (w) => (w.regions[0].x0 = -30000), 'regions.0.x0', /within ±20000 mm/],
		[
			'a missing field',
			(w) => delete w.regions[0].y1,
			'regions.0.y1',
			/^Region 1 \(“brick”\): y1 must be given$/
		],
		[
			'a boundary inside the material',
			(w) => w.boundaries.push({ from: P(300, 0), to: P(300, 1000), environment: 'in' }),
			'boundaries.2',
			/^Boundary 3 does not lie on the edge of the material: from \(300, 0\) to \(300, 1000\) mm it has material on both sides$/
		],
		[
			'a boundary away from the material',
			(w) => w.boundaries.push({ from: P(500, 0), to: P(500, 1000), environment: 'in' }),
			'boundaries.2',
			/^Boundary 3 does not lie on the edge of the material: .* no material on either side$/
		],
		[
			'a sloping boundary',
			(w) => w.boundaries.push({ from: P(0, 0), to: P(400, 1000), environment: 'in' }),
			'boundaries.2',
			/Boundary 3 must be horizontal or vertical/
		],
		[
			'a boundary of no length',
			(w) => w.boundaries.push({ from: P(0, 0), to: P(0, 0), environment: 'in' }),
			'boundaries.2',
			/Boundary 3 has no length/
		],
		[
			'overlapping boundaries',
			(w) => w.boundaries.push({ from: P(0, 500), to: P(0, 1000), environment: 'out' }),
			'boundaries.2',
			/Boundary 3 overlaps boundary 1 from \(0, 500\) to \(0, 1000\) mm/
		],
		[
			'an undefined environment',
			(w) => (w.boundaries[1].environment = 'outdoor'),
			'boundaries.1.environment',
			/^Boundary 2: environment names "outdoor", which is not among the environments$/
		],
		[
			'a single temperature',
			(w) => ((w.environments as Record<string, { temperature: number }>).out.temperature = 20),
			'environments',
			/two of different temperatures/
		],
		[
			'a negative Rs',
			(w) => ((w.environments as Record<string, { rs: number }>).out.rs = -1),
			'environments.out.rs',
			/^Environment “out”: Rs must be 0 or more/
		],
		[
			'too many regions',
			(w) => (w.regions = Array.from({ length: 201 }, () => w.regions[0])),
			'regions',
			/at most 200 items, got 201/
		],
		['no regions', (w) => (w.regions = []), 'regions', /at least 1 item/],
		[
			'a probe outside the material',
			(w) => (w.probes = [P(500, 500)]),
			'probes.0',
			/^Probe 1 at \(500, 500\) mm lies outside the material$/
		],
		[
			'a probe coordinate as text',
			(w) => (w.probes = [[1, 'a']]),
			'probes.0.1',
			/^Probe 1: y must be a finite number/
		],
		[
			'a piece of material with no boundary',
			(w) => w.regions.push({ name: 'island', x0: 1000, y0: 0, x1: 1100, y1: 100, lambda: 1 }),
			'regions.2',
			/^Region 3 \(“island”\) belongs to a piece of material that no boundary touches|^Region 3 belongs/
		],
		['a zero maxCellMm', (w) => (w.maxCellMm = 0), 'maxCellMm', /maxCellMm must be at least 0.01 mm/],
		[
			'a negative U-value',
			(w) => (w.flanks = [{ uValue: -1, lengthMm: 1000 }]),
			'flanks.0.uValue',
			/^Flank 1: U-value must be 0 or more$/
		]
	];
	for (const [what, change, path, message] of cases)
		it(what, () => {
			const issues = issuesOf(change);
			expect(issues.length).toBeGreaterThan(0);
			const issue = issues.find((i) => i.path === path);
			expect(issue, JSON.stringify(issues)).toBeDefined();
			expect(issue!.message).toMatch(message);
		});

	it('refuses what is not an object, and analyseJunction throws the same issues', () => {
		for (const raw of [null, 'wall', 42, []]) {
			const r = parseJunctionInput(raw);
			expect(r.ok).toBe(false);
		}
		const bad = { ...wall(), regions: [{ ...wall().regions[0], lambda: -1 }] };
		try {
			analyseJunction(bad);
			expect.unreachable();
		} catch (e) {
			expect(e).toBeInstanceOf(JunctionInputError);
			expect((e as JunctionInputError).issues[0]).toMatchObject({ path: 'regions.0.lambda' });
			expect((e as JunctionInputError).message).toContain('Region 1');
		}
	});
});

describe('the node cap (JUNCTION_NODES_MAX, this product’s bound)', () => {
	it('refuses a maxCellMm that would need more nodes than allowed, naming maxCellMm', () => {
		const issues = issuesOf((w) => (w.maxCellMm = 0.05));
		expect(issues).toHaveLength(1);
		expect(issues[0].path).toBe('maxCellMm');
		expect(issues[0].message).toMatch(/more than the 200000 nodes allowed.*give a larger maxCellMm/);
	});

	it('refuses a geometry whose edges alone need too many nodes, naming the regions', () => {
		// a 40 m square holding 199 small squares on distinct coordinates: 400 key lines an axis
		const regions = [{ x0: -20000, y0: -20000, x1: 20000, y1: 20000, lambda: 1 }];
		for (let i = 0; i < 199; i++) {
			const x = -19900 + 199.3 * i;
			const y = -19900 + 199.7 * i;
			regions.push({ x0: x, y0: y, x1: x + 10, y1: y + 10, lambda: 50 });
		}
		const r = parseJunctionInput({
			regions,
			boundaries: [
				{ from: P(-20000, 20000), to: P(20000, 20000), environment: 'in' },
				{ from: P(-20000, -20000), to: P(20000, -20000), environment: 'out' }
			],
			environments: wall().environments
		});
		expect(r.ok).toBe(false);
		if (!r.ok)
			expect(r.issues[0]).toMatchObject({
				path: 'regions',
				message: expect.stringMatching(/use fewer distinct coordinates/)
			});
	});

	it('stops refining at the cap and says so when the criterion is not yet met', () => {
		// fixed temperatures meeting at corners: L2D grows without bound as the mesh is refined
		const r = analyseJunction({
			regions: [{ x0: 0, y0: 0, x1: 1000, y1: 1000, lambda: 1 }],
			boundaries: [
				{ from: P(0, 1000), to: P(1000, 1000), environment: 'hot' },
				{ from: P(0, 0), to: P(0, 1000), environment: 'cold' },
				{ from: P(1000, 0), to: P(1000, 1000), environment: 'cold' }
			],
			environments: { hot: { temperature: 20, rs: 0 }, cold: { temperature: 0, rs: 0 } }
		});
		expect(r.mesh.nodes).toBeLessThanOrEqual(JUNCTION_NODES_MAX);
		expect(r.mesh.nodes).toBeGreaterThan(JUNCTION_NODES_MAX / 4);
		expect(r.convergence.met).toBe(false);
		expect(r.cautions.some((c) => /could not be refined to meet the 1 % criterion/.test(c))).toBe(true);
		expect(firstNonFinite(r)).toBeNull();
	});
});

describe('notes and cautions for special inputs', () => {
	it('takes an Rs below 10⁻⁶ as zero, with a note; reports unused environments with no flow', () => {
		const input = wall();
		input.environments = {
			...input.environments,
			out: { temperature: 0, rs: 1e-9 },
			attic: { temperature: 5, rs: 0.1 }
		};
		const r = analyseJunction(input);
		expect(r.notes.join(' ')).toMatch(/taken as zero.*out/);
		expect(r.notes.join(' ')).toMatch(/no boundary faces.*attic/);
		expect(r.heatFlows.attic).toBe(0);
		// a fixed outside surface: U = 1/(Rsi + Σ d/λ) by hand (ISO 6946 without Rse)
		expect(r.couplingCoefficient).toBeCloseTo(1 / (0.13 + 0.3 / 0.8 + 0.1 / 0.035), 9);
	});

	it('says when more than two temperatures are faced', () => {
		const input = wall();
		input.boundaries.push({ from: P(0, 1000), to: P(400, 1000), environment: 'loft' });
		input.environments = { ...input.environments, loft: { temperature: 8, rs: 0.1 } };
		const r = analyseJunction(input);
		expect(r.cautions[0]).toMatch(/more than two temperatures/);
		expect(Math.abs(r.heatFlows.in + r.heatFlows.out + r.heatFlows.loft) / r.heatFlows.in).toBeLessThan(1e-8);
	});
});

/** Every temperature of a result between the coldest and the warmest environment (maximum principle). */
function withinEnvironments(r: JunctionResult, input: JunctionInput): boolean {
	const used = input.boundaries.map((b) => input.environments[b.environment].temperature);
	const lo = Math.min(...used) - 1e-6;
	const hi = Math.max(...used) + 1e-6;
	return [r.coldest.temperature, ...(r.probes ?? [])].every((t) => t >= lo && t <= hi);
}

describe('randomised accepted inputs give finite, balanced, bounded results', () => {
	// layered boxes: a base region covering the box (so the material has no holes), up to six more
	// regions anywhere inside it, λ log-uniform over the whole accepted range, Rs from 0 to 10
	const lambda = fc.double({ min: -3, max: 4, noNaN: true }).map((e) => Number((10 ** e).toPrecision(3)));
	const coord = fc.integer({ min: 0, max: 100 }).map((v) => v * 10);
	const rect = fc.tuple(coord, coord, coord, coord, lambda).filter(([a, b, c, d]) => a !== c && b !== d);
	const rs = fc.constantFrom(0, 1e-7, 0.04, 0.13, 0.25, 10);
	const input = fc
		.record({
			inner: fc.array(rect, { maxLength: 6 }),
			base: lambda,
			rsIn: rs,
			rsOut: rs,
			tIn: fc.integer({ min: 100, max: 1000 }),
			dt: fc.integer({ min: 1, max: 200 }),
			probes: fc.array(fc.tuple(coord, coord), { maxLength: 5 })
		})
		.map((v): JunctionInput => ({
			regions: [
				{ x0: 0, y0: 0, x1: 1000, y1: 1000, lambda: v.base },
				...v.inner.map(([a, b, c, d, l]) => ({
					x0: Math.min(a, c),
					y0: Math.min(b, d),
					x1: Math.max(a, c),
					y1: Math.max(b, d),
					lambda: l
				}))
			],
			boundaries: [
				{ from: P(0, 1000), to: P(1000, 1000), environment: 'in' },
				{ from: P(0, 0), to: P(0, 400), environment: 'out' },
				{ from: P(0, 0), to: P(1000, 0), environment: 'out' }
			],
			environments: {
				in: { temperature: v.tIn, rs: v.rsIn },
				out: { temperature: v.tIn - v.dt, rs: v.rsOut }
			},
			probes: v.probes.map(([x, y]) => P(x, y)),
			maxCellMm: 200
		}));

	it('for random junctions (JUNCTION_PROPERTY_RUNS, default 12)', () => {
		fc.assert(
			fc.property(input, (junction) => {
				const r = analyseJunction(junction);
				expect(firstNonFinite(r)).toBeNull();
				expect(r.couplingCoefficient).toBeGreaterThan(0);
				expect(withinEnvironments(r, junction)).toBe(true);
				expect(r.fRsi).toBeGreaterThanOrEqual(-1e-9);
				expect(r.fRsi).toBeLessThanOrEqual(1 + 1e-9);
			}),
			{ numRuns: Number(process.env.JUNCTION_PROPERTY_RUNS ?? 12), seed: 20240611 }
		);
	}, 120000);
});
