// No accepted input can crash, hang or fool the calculation engine: the bounds of the element
// input (parseElementInput), negligible resistances taken as zero, the cap on Glaser sublayers,
// parsed input that cannot be changed afterwards, and results without a non-finite number.
//
// The bounds themselves (100 m²·K/W per layer, 200 in total, μ ≤ 10⁸, sd ≤ 100 000 m, …) are this
// product's own choices (src/lib/physics/bounds.ts), not numbers of a standard; the tests name
// them as such. Physical expectations name their source beside the number.
import { spawnSync } from 'node:child_process';
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	buildThermalModel,
	ElementInputError,
	elementResultSchema,
	GLASER_SUBLAYERS_MAX,
	parseElementInput,
	RSE,
	RSI,
	type ElementInput,
	type FieldIssue
} from '../../src/lib/physics';
import { buildHeatChain } from '../../src/lib/physics/element-heat-chain';
import { closedFormSeries, coolClimate, constantClimate, firstNonFinite } from './helpers';

/** A masonry wall whose second layer is `second` (constructed input, not a product). */
const wall = (second: ElementInput['layers'][number]): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'plaster', thicknessMm: 15, lambda: 0.57, mu: 10 },
		second,
		{ name: 'insulation', thicknessMm: 100, lambda: 0.035, mu: 1 },
		{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.1 }
	],
	internal: { temperature: 20, relativeHumidity: 60 },
	climate: coolClimate()
});
const layerWithLambda = (lambda: number) => ({ name: 'layer under test', thicknessMm: 100, lambda, mu: 5 });

function issuesOf(raw: unknown): FieldIssue[] {
	const r = parseElementInput(raw);
	expect(r.ok, JSON.stringify(raw)).toBe(false);
	return r.ok ? [] : r.issues;
}
const pathsOf = (raw: unknown) => issuesOf(raw).map((i) => i.path);
const issueAt = (raw: unknown, path: string) => issuesOf(raw).find((i) => i.path === path);

/** Run tests/physics/robustness.child.ts with a 64 MB heap and a timeout; its one line of JSON. */
function inChild(which: string): {
	status: number | null;
	signal: string | null;
	out: unknown;
	stderr: string;
} {
	const r = spawnSync(
		process.execPath,
		['--max-old-space-size=64', '--import', 'tsx', 'tests/physics/robustness.child.ts', which],
		{ encoding: 'utf8', timeout: 60_000, killSignal: 'SIGKILL' }
	);
	let out: unknown = null;
	try {
		out = JSON.parse(r.stdout.trim().split('\n').pop() ?? '');
	} catch {
		out = r.stdout.slice(0, 500);
	}
	return { status: r.status, signal: r.signal, out, stderr: r.stderr.slice(-2000) };
}

describe('defect: a layer of enormous resistance exhausted the memory', () => {
	// Before: λ = 1e-9 W/(m·K) over 100 mm (R = 10⁸ m²·K/W) was split into ~4×10⁸ sublayers and the
	// process died of heap exhaustion; λ = 1e-6 cost 0.5 s, 170 MB and 400 001 profile points.
	it('λ = 1e-9 and λ = 1e-6 are refused at the layer’s λ, saying what to do', () => {
		for (const lambda of [1e-9, 1e-6]) {
			const issue = issueAt(wall(layerWithLambda(lambda)), 'layers.1.lambda');
			expect(issue, String(lambda)).toBeDefined();
			// R = d/λ (ISO 6946:2017, 6.7.1): 0.1 m / 1e-6 = 1e5 m²·K/W; the bound 100 m²·K/W is this product's
			expect(issue!.message).toMatch(/100 m²·K\/W/);
			expect(issue!.message).toMatch(/check λ/);
		}
	});

	it('in a child process with a 64 MB heap, analysing the raw input is refused, not a crash', () => {
		for (const which of ['lambda-1e-9', 'lambda-1e-6']) {
			const r = inChild(which);
			expect(r.signal, `${which}: ${r.stderr}`).toBeNull();
			expect(r.status, `${which}: ${r.stderr}`).toBe(0);
			const out = r.out as { refused?: FieldIssue[] };
			expect(
				out.refused?.map((i) => i.path),
				JSON.stringify(r.out)
			).toContain('layers.1.lambda');
		}
	}, 150_000);

	it('the largest accepted resistances are analysed in the same small heap, with the sublayers capped', () => {
		const r = inChild('largest-accepted');
		expect(r.signal, r.stderr).toBeNull();
		expect(r.status, r.stderr).toBe(0);
		const out = r.out as { result: { profilePoints: number; glaserNodes: number; notes: string[] } };
		expect(out.result, JSON.stringify(r.out)).toBeDefined();
		// two layers of R = 100: ISO 13788:2012, 6.2 asks for ⌈100/0.25⌉ = 400 sublayers each; the cap
		// (this product's) gives GLASER_SUBLAYERS_MAX each, plus the two surface nodes
		expect(out.result.glaserNodes).toBe(2 * GLASER_SUBLAYERS_MAX + 1);
		expect(out.result.notes.filter((n) => /sublayers/.test(n))).toHaveLength(2);
	}, 90_000);

	it('the costliest accepted input found is analysed in the same small heap', () => {
		const r = inChild('most-work');
		expect(r.signal, r.stderr).toBeNull();
		expect(r.status, r.stderr).toBe(0);
		const out = r.out as { result: { glaserNodes: number } };
		// 100 layers of R = 2: ⌈2/0.25⌉ = 8 sublayers each (ISO 13788:2012, 6.2), plus the surface node
		expect(out.result?.glaserNodes, JSON.stringify(r.out)).toBe(801);
	}, 90_000);

	it('a layer over the cap is split into at most GLASER_SUBLAYERS_MAX sublayers, with a note; below it the standard’s rule holds', () => {
		const input = wall({ name: 'thick', thicknessMm: 1000, lambda: 0.01, mu: 1 }); // R = 100
		const tm = buildThermalModel(input);
		const chain = buildHeatChain(tm);
		// Rsi film + plaster (R 0.026: 1) + thick (capped) + insulation (R 2.857: ⌈2.857/0.25⌉ = 12,
		// ISO 13788:2012, 6.2) + render (1) + external film
		expect(chain.elements).toBe(1 + 1 + GLASER_SUBLAYERS_MAX + 12 + 1 + 1);
		expect(tm.notes.join(' ')).toMatch(/Layer 2 \(thick\).*sublayers/);
		const r = analyseElement(input);
		expect(firstNonFinite(r)).toBeNull();
		// U by the series sum (ISO 6946:2017, 6.7.1 and Table 7): 1/(0.13 + 0.015/0.57 + 100 + 0.1/0.035 + 0.01/0.8 + 0.04)
		expect(r.uValue).toBeCloseTo(1 / (0.13 + 0.015 / 0.57 + 100 + 0.1 / 0.035 + 0.01 / 0.8 + 0.04), 12);
	});

	it('a layer above 100 m²·K/W and layers above 200 m²·K/W in total are refused (this product’s bounds)', () => {
		expect(
			issueAt(wall({ name: 'x', thicknessMm: 101, lambda: 0.001, mu: 1 }), 'layers.1.lambda')
		).toBeDefined();
		expect(
			issueAt(wall({ name: 'x', thicknessMm: 10, resistance: 100.5, mu: 1 }), 'layers.1.resistance')
		).toBeDefined();
		const three = {
			heatFlow: 'horizontal',
			layers: [
				{ name: 'a', thicknessMm: 100, resistance: 90 },
				{ name: 'b', thicknessMm: 100, resistance: 90 },
				{ name: 'c', thicknessMm: 90, lambda: 0.001 }
			]
		};
		const total = issueAt(three, 'layers');
		expect(total?.message).toMatch(/270 m²·K\/W.*200 m²·K\/W/);
		// 200 in total is still accepted
		expect(
			parseElementInput({
				...three,
				layers: three.layers.slice(0, 2).map((l) => ({ ...l, resistance: 100 }))
			}).ok
		).toBe(true);
	});

	it('a bridge of enormous resistance is refused at the bridge’s λ', () => {
		const input = wall({
			name: 'bridged',
			thicknessMm: 100,
			lambda: 0.04,
			mu: 1,
			bridge: { lambda: 1e-9, fraction: 0.1 }
		});
		expect(issueAt(input, 'layers.1.bridge.lambda')?.message).toMatch(/100 m²·K\/W/);
	});
});

describe('defect: a layer of negligible resistance turned every temperature into NaN', () => {
	// Before: 100 mm of λ = 1e16 gave the right U but NaN (JSON null) temperatures and heat flux;
	// R ≈ 1e-18 gave a wrong inside-surface temperature and a spurious Glaser outcome.
	const rsi = RSI.horizontal; // 0.13, ISO 6946:2017, Table 7
	const rse = RSE; // 0.04, ISO 6946:2017, Table 7
	const others = [0.015 / 0.57, 0.1 / 0.035, 0.01 / 0.8]; // R = d/λ, ISO 6946:2017, 6.7.1

	for (const [label, second] of [
		['λ = 1e16', layerWithLambda(1e16)],
		['R = 1e-18', { name: 'layer under test', thicknessMm: 100, resistance: 1e-18, mu: 5 }],
		['R = 9e-7', { name: 'layer under test', thicknessMm: 100, resistance: 9e-7, mu: 5 }]
	] as const) {
		it(`${label}: the layer is taken as zero resistance, with a note, and the temperatures are those of the series sum`, () => {
			const r = analyseElement(wall(second));
			expect(firstNonFinite(r)).toBeNull();
			// closed-form series between 20 °C inside and −2 °C (coldest month of the climate), R of the
			// layer under test 0: θ at each interface = θi − (θi − θe)·ΣR/RT (steady 1-D conduction)
			const ref = closedFormSeries([rsi, others[0], 0, others[1], others[2], rse], 20, -2);
			expect(r.interfaces.map((p) => p.temperature)).toEqual(
				ref.values.slice(1, 6).map((v) => expect.closeTo(v, 9))
			);
			expect(r.interfaces[0].temperature).toBeCloseTo(19.07, 2); // the same, to two decimals
			expect(r.heatFlux).toBeCloseTo(ref.flux, 9);
			expect(r.notes.join(' ')).toMatch(/Layer 2 \(layer under test\): R = .* is taken as zero/);
			// the Glaser check is that of the same layer with R = 0 exactly (the kernel's zero-resistance
			// path, checked against a dense solve in series.test.ts)
			const exact = analyseElement(wall({ ...second, lambda: undefined, resistance: 0 } as never));
			expect(r.condensation).toStrictEqual(exact.condensation);
		});
	}

	it('a single layer of λ = 1e16: U, θsi and q by the series sum of the films alone', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			layers: [{ name: 'x', thicknessMm: 100, lambda: 1e16 }]
		});
		// RT = Rsi + Rse = 0.17 (ISO 6946:2017, Table 7); profile at the default 20 °C / 0 °C
		expect(r.uValue).toBeCloseTo(1 / 0.17, 12);
		expect(r.interfaces[0].temperature).toBeCloseTo(20 - (20 * 0.13) / 0.17, 9); // 4.706 °C
		expect(r.heatFlux).toBeCloseTo(20 / 0.17, 9);
		expect(firstNonFinite(r)).toBeNull();
	});

	it('a given Rsi or Rse below 1e-6 m²·K/W is taken as zero, with a note', () => {
		const r = analyseElement({
			heatFlow: 'horizontal',
			rsi: 1e-12,
			rse: 1e-300,
			layers: [{ name: 'board', thicknessMm: 100, lambda: 0.04 }]
		});
		expect(firstNonFinite(r)).toBeNull();
		expect([r.rsi, r.rse]).toEqual([0, 0]);
		expect(r.uValue).toBeCloseTo(1 / 2.5, 12); // R = 0.1/0.04 (ISO 6946:2017, 6.7.1)
		expect(r.interfaces[0].temperature).toBe(20); // no film: the surface is at the air temperature
		expect(r.notes.filter((n) => /taken as zero/.test(n))).toHaveLength(2);
	});
});

describe('defect: a parsed input changed afterwards was trusted', () => {
	const raw = (): ElementInput => ({
		heatFlow: 'horizontal',
		layers: [{ name: 'a', thicknessMm: 100, lambda: 0.04 }]
	});
	// U = 1/(0.13 + 0.1/0.04 + 0.04) (ISO 6946:2017, 6.7.1 and Table 7)
	const u = 1 / (0.13 + 2.5 + 0.04);

	it('parseElementInput returns a deep-frozen value and leaves the raw input as it was', () => {
		const input = raw();
		const p = parseElementInput(input);
		expect(p.ok).toBe(true);
		if (!p.ok) return;
		expect(Object.isFrozen(p.data)).toBe(true);
		expect(Object.isFrozen(p.data.layers)).toBe(true);
		expect(Object.isFrozen(p.data.layers[0])).toBe(true);
		expect(Object.isFrozen(input) || Object.isFrozen(input.layers[0])).toBe(false);
	});

	it('λ = −1 set on a parsed input: the change is refused and cannot produce a result', () => {
		const p = parseElementInput(raw());
		if (!p.ok) throw new Error('valid input refused');
		expect(() => {
			(p.data.layers[0] as { lambda?: number }).lambda = -1;
		}).toThrow(TypeError);
		expect(analyseElement(p.data).uValue).toBeCloseTo(u, 12); // still the input as validated
		// a changed copy is validated again
		const copy = structuredClone(p.data);
		copy.layers[0].lambda = -1;
		expect(() => analyseElement(copy)).toThrow(ElementInputError);
		expect(() => analyseElement(copy)).toThrow('layers.0.lambda: must be > 0');
	});

	it('a NaN thickness set on a parsed input: refused, and a copy says the thickness is not a number', () => {
		const p = parseElementInput(raw());
		if (!p.ok) throw new Error('valid input refused');
		expect(() => {
			p.data.layers[0].thicknessMm = Number.NaN;
		}).toThrow(TypeError);
		expect(analyseElement(p.data).uValue).toBeCloseTo(u, 12);
		const copy = structuredClone(p.data);
		copy.layers[0].thicknessMm = Number.NaN;
		let err: unknown;
		try {
			analyseElement(copy);
		} catch (e) {
			err = e;
		}
		expect(err).toBeInstanceOf(ElementInputError);
		expect((err as ElementInputError).issues).toEqual([
			{ path: 'layers.0.thicknessMm', message: 'must be a finite number, got NaN' }
		]);
		expect((err as Error).message).not.toMatch(/total thermal resistance/);
	});

	it('a result shares no object with the frozen input (callers may change their result)', () => {
		const p = parseElementInput({
			...wall(layerWithLambda(0.5)),
			designTemperatures: { internal: 21, external: -3 }
		});
		if (!p.ok) throw new Error('valid input refused');
		const frozen: string[] = [];
		const walk = (v: unknown, path: string) => {
			if (typeof v !== 'object' || v === null) return;
			if (Object.isFrozen(v)) frozen.push(path);
			for (const [k, x] of Object.entries(v)) walk(x, `${path}.${k}`);
		};
		walk(analyseElement(p.data), '$');
		expect(frozen).toEqual([]);
	});
});

describe('defect: /api/v1/calculate answered 500 (the engine threw past the validation)', () => {
	it('a zero total resistance (Rsi = 0, Rse = 0, one layer of R = 0) is an input issue', () => {
		const zero = {
			heatFlow: 'horizontal',
			rsi: 0,
			rse: 0,
			layers: [{ name: 'foil', thicknessMm: 0.1, resistance: 0 }]
		};
		expect(issuesOf(zero)).toEqual([
			{
				path: 'layers',
				message: 'the total thermal resistance is zero: give Rsi, Rse or a layer with resistance'
			}
		]);
		expect(() => analyseElement(zero as ElementInput)).toThrow(ElementInputError);
	});

	it('zero total resistance through a slightly ventilated air layer at Av = 1500 mm² with Rsi = 0', () => {
		// ISO 6946:2017, 6.9.3: RT = (1500 − Av)/1000·RT,u + (Av − 500)/1000·RT,v = 0·RT,u + 1·RT,v,
		// and RT,v = Rsi + Rse(= Rsi, 6.9.4) + nothing inside the air layer = 0
		const input = {
			heatFlow: 'horizontal',
			rsi: 0,
			layers: [
				{ name: 'cavity', thicknessMm: 50, air: 'slightly-ventilated', openingAreaMm2: 1500 },
				{ name: 'brick', thicknessMm: 102, lambda: 0.77 }
			]
		};
		expect(pathsOf(input)).toEqual(['layers']);
		expect(() => analyseElement(input as ElementInput)).toThrow(ElementInputError);
	});

	it('μ = 1e308 is refused at the layer’s μ; so is a μ·d over 100 000 m', () => {
		const huge = wall({ name: 'layer under test', thicknessMm: 100, lambda: 1, mu: 1e308 });
		expect(issueAt(huge, 'layers.1.mu')?.message).toMatch(/≤/);
		expect(() => analyseElement(huge)).toThrow(ElementInputError);
		// μ·d = 1e7 × 0.1 m = 10⁶ m (ISO 13788:2012, 3.1: sd = μ·d) > 100 000 m
		const thick = wall({ name: 'layer under test', thicknessMm: 100, lambda: 1, mu: 1e7 });
		expect(issueAt(thick, 'layers.1.mu')?.message).toMatch(/100 000 m/);
		expect(parseElementInput(wall({ name: 'foil', thicknessMm: 0.05, resistance: 0, mu: 3e7 })).ok).toBe(
			true
		);
	});
});

describe('every other bound names its field and says what to do', () => {
	const base = (): ElementInput => wall(layerWithLambda(0.5));
	const withLayer = (patch: Record<string, unknown>) => {
		const input = base() as unknown as { layers: Record<string, unknown>[] };
		input.layers[1] = { ...input.layers[1], ...patch };
		return input;
	};
	const cases: [string, unknown, string][] = [
		['a thickness below 0.001 mm', withLayer({ thicknessMm: 0.0001 }), 'layers.1.thicknessMm'],
		['μ above 10⁸', withLayer({ mu: 2e8, thicknessMm: 0.01 }), 'layers.1.mu'],
		['a given sd over 100 000 m', withLayer({ mu: undefined, sd: 200000 }), 'layers.1.sd'],
		['a name of 201 characters', withLayer({ name: 'x'.repeat(201) }), 'layers.1.name'],
		[
			'a bridge μ·d over 100 000 m',
			withLayer({ bridge: { lambda: 0.13, fraction: 0.1, mu: 1e8 } }),
			'layers.1.bridge.mu'
		],
		[
			'bridge centres over 10 000 mm',
			withLayer({ bridge: { lambda: 0.13, widthMm: 50, centresMm: 20000 } }),
			'layers.1.bridge.centresMm'
		],
		[
			'fastener λ over 1000',
			withLayer({ fasteners: { lambda: 1e308, areaMm2: 10, perM2: 4 } }),
			'layers.1.fasteners.lambda'
		],
		[
			'fastener area over 10 000 mm²',
			withLayer({ fasteners: { lambda: 50, areaMm2: 1e6, perM2: 4 } }),
			'layers.1.fasteners.areaMm2'
		],
		[
			'fasteners over 10 000 per m²',
			withLayer({ fasteners: { lambda: 50, areaMm2: 10, perM2: 1e9 } }),
			'layers.1.fasteners.perM2'
		],
		[
			'101 layers',
			{
				heatFlow: 'horizontal',
				layers: Array.from({ length: 101 }, (_, i) => ({ name: `l${i}`, thicknessMm: 10, lambda: 1 }))
			},
			'layers'
		],
		[
			'a floor whose B′ = A/(0.5·P) exceeds 10 000 m',
			{
				heatFlow: 'downward',
				layers: [{ name: 'slab', thicknessMm: 150, lambda: 1.5 }],
				ground: { perimeterM: 1e-3, areaM2: 100 }
			},
			'ground.perimeterM'
		]
	];
	for (const [label, input, path] of cases) {
		it(label, () => {
			const issue = issueAt(input, path);
			expect(issue, JSON.stringify(issuesOf(input))).toBeDefined();
			expect(issue!.message.length).toBeGreaterThan(8);
			expect(() => analyseElement(input as ElementInput)).toThrow(ElementInputError);
		});
	}
});

describe('no result of an edge input holds a non-finite number', () => {
	const layer = (p: Record<string, unknown>) => ({ name: 'edge', thicknessMm: 100, ...p });
	const film = (rsi: number, rse: number, layers: unknown[]) => ({
		heatFlow: 'horizontal',
		rsi,
		rse,
		layers
	});
	const withMoisture = (i: Record<string, unknown>) => ({
		...i,
		internal: { temperature: 20, relativeHumidity: 60 },
		climate: coolClimate()
	});
	const edges: [string, unknown][] = [
		[
			'one layer of R = 100 and one of λ giving 100',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ resistance: 100, mu: 1 }), layer({ lambda: 0.001, sd: 1 })]
			})
		],
		[
			'λ = 1e308',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 1e308, mu: 1 }), layer({ lambda: 0.04, mu: 1 })]
			})
		],
		[
			'R = 5e-324 given',
			withMoisture({
				heatFlow: 'upward',
				layers: [layer({ resistance: 5e-324, mu: 1 }), layer({ lambda: 0.04, mu: 1 })]
			})
		],
		['Rsi = Rse = 0 and a layer of R = 1e-6', film(0, 0, [layer({ resistance: 1e-6 })])],
		[
			'Rsi = Rse = 0 and λ = 1e308 beside a board',
			film(0, 0, [layer({ lambda: 1e308 }), layer({ lambda: 0.04 })])
		],
		[
			'thickness 0.001 mm of μ 1, sd of 1e-6 m',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ thicknessMm: 0.001, lambda: 0.04, mu: 1 }), layer({ lambda: 0.04, mu: 1 })]
			})
		],
		[
			'sd 1e-300 and sd 100 000 m',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 0.04, sd: 1e-300 }), layer({ lambda: 0.04, sd: 100000 })]
			})
		],
		[
			'μ = 10⁸ on a 1 mm foil',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 0.04, mu: 1 }), layer({ thicknessMm: 1, resistance: 0, mu: 1e8 })]
			})
		],
		[
			'a bridge of λ = 1e308',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 0.04, mu: 1, bridge: { lambda: 1e308, fraction: 0.5 } })]
			})
		],
		[
			'a bridge of the smallest width at the largest centres',
			withMoisture({
				heatFlow: 'horizontal',
				layers: [
					layer({ lambda: 0.04, mu: 1, bridge: { lambda: 0.13, widthMm: 1e-300, centresMm: 10000, mu: 1e6 } })
				]
			})
		],
		[
			'fasteners at their bounds through the thinnest layer',
			{
				heatFlow: 'horizontal',
				corrections: 'always',
				layers: [
					layer({
						thicknessMm: 0.001,
						lambda: 1e-5,
						fasteners: { lambda: 1000, areaMm2: 10000, perM2: 10000 }
					})
				]
			}
		],
		[
			'a floor of the largest B′, Rse = 0, no wall',
			{
				heatFlow: 'downward',
				rse: 0,
				layers: [layer({ lambda: 1.5 })],
				ground: { perimeterM: 0.02, areaM2: 100, wallThicknessM: 0 }
			}
		],
		[
			'a floor of a tiny B′, Rse = 0, no wall',
			{
				heatFlow: 'downward',
				rse: 0,
				layers: [layer({ lambda: 1.5 })],
				ground: { perimeterM: 100000, areaM2: 1e-300, wallThicknessM: 0 },
				internal: { temperature: 20, relativeHumidity: 50 },
				climate: coolClimate()
			}
		],
		[
			'100 layers, 8 bridged, at the total bound',
			withMoisture({
				heatFlow: 'horizontal',
				layers: Array.from({ length: 100 }, (_, i) =>
					layer({
						resistance: 2,
						mu: 1000,
						...(i % 13 === 0 ? { bridge: { lambda: 0.13, fraction: 0.2, mu: 1 } } : {})
					})
				)
			})
		],
		[
			'internal and external temperature equal',
			{
				...withMoisture({ heatFlow: 'horizontal', layers: [layer({ lambda: 0.04, mu: 1 })] }),
				climate: constantClimate(20, 50)
			}
		],
		[
			'the extreme temperatures and humidities',
			{
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 0.04, mu: 1 }), layer({ thicknessMm: 1, resistance: 0, sd: 100 })],
				internal: { temperature: 80, relativeHumidity: 100 },
				climate: constantClimate(-80, 100)
			}
		],
		[
			'internal humidity 5e-324 %',
			{
				heatFlow: 'horizontal',
				layers: [layer({ lambda: 0.04, mu: 1 })],
				internal: { temperature: 20, relativeHumidity: 5e-324 },
				climate: constantClimate(-10, 0)
			}
		],
		[
			'Rsi = 10, Rse = 10, surface check Rsi 1e-300',
			{ ...withMoisture(film(10, 10, [layer({ lambda: 0.04, mu: 1 })])), surfaceRsi: 1e-300 }
		],
		[
			'a roof space over a zero-resistance layer with Rsi = Rse = 0',
			{ heatFlow: 'upward', rsi: 0, rse: 0, roofSpace: 'tiles-no-felt', layers: [layer({ resistance: 0 })] }
		],
		[
			'rounding to 6 significant figures of a tiny U',
			{
				heatFlow: 'horizontal',
				rounding: { mode: 'significant', digits: 6 },
				layers: [layer({ resistance: 100 }), layer({ resistance: 100 })]
			}
		]
	];
	for (const [label, input] of edges) {
		it(label, () => {
			const parsed = parseElementInput(input);
			expect(parsed.ok, JSON.stringify(parsed.ok ? null : parsed.issues)).toBe(true);
			const r = analyseElement(input as ElementInput);
			expect(firstNonFinite(r)).toBeNull();
			expect(r.uValue).toBeGreaterThan(0);
			expect(elementResultSchema.safeParse(r).success).toBe(true);
		});
	}
});
