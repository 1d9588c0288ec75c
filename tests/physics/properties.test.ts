// Property test of the calculation engine with fast-check: build-ups generated within the input
// schema (layers of every kind, λ or R from negligible to the bound, μ or sd from still air to
// the bound, bridges by fraction or by width and centres, fasteners, air layers of each
// ventilation, floors on the ground, roof spaces, films given or not, climates and internal
// conditions) → every accepted input gives a finite result with U > 0 and every interface
// temperature between the two design temperatures; a refused one gives issues that name a field.
//
// The properties are facts of steady one-dimensional conduction (common practice, no source): a
// positive total resistance gives U > 0, and a series of positive resistances between two fixed
// temperatures has every node between them. The 200 ms per case is a loose sanity bound against
// a runaway (a hang or a huge chain), not a speed target; speed is measured in bench/physics.bench.ts.
//
// Runs: PHYSICS_PROPERTY_RUNS (default 300) and PHYSICS_PROPERTY_SEED (default fixed, so a
// failure in CI is reproducible) — e.g. PHYSICS_PROPERTY_RUNS=5000 for a longer search.
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	BRIDGE_SPACING_MAX_MM,
	ElementInputError,
	elementResultSchema,
	LAYER_R_MAX,
	LAYER_SD_MAX,
	MU_MAX,
	parseElementInput,
	ROOF_SPACES,
	THICKNESS_MIN_MM,
	type ElementInput
} from '../../src/lib/physics';
import { firstNonFinite } from './helpers';

const RUNS = Number(process.env.PHYSICS_PROPERTY_RUNS ?? 300);
const SEED = Number(process.env.PHYSICS_PROPERTY_SEED ?? 6946);
const BUDGET_MS = 200; // a loose sanity bound per case (see the header), not a speed target
const TOLERANCE_K = 1e-9; // round-off of the temperatures, K

type Layer = ElementInput['layers'][number];

/** A number spread evenly over the decades between `min` and `max` (both > 0). */
const logUniform = (min: number, max: number) =>
	fc.double({ min: Math.log10(min), max: Math.log10(max), noNaN: true }).map((x) => 10 ** x);

/** Thickness, mm: mostly real, sometimes at the bounds. */
const thickness = fc.oneof(
	{ weight: 6, arbitrary: fc.double({ min: 1, max: 400, noNaN: true }) },
	{ weight: 1, arbitrary: logUniform(THICKNESS_MIN_MM, 10000) },
	{ weight: 1, arbitrary: fc.constantFrom(THICKNESS_MIN_MM, 0.1, 10000) }
);
/** Thermal resistance of a layer, m²·K/W: mostly real, sometimes negligible, zero or at the bound. */
const resistance = fc.oneof(
	{ weight: 6, arbitrary: logUniform(0.001, 10) },
	{ weight: 1, arbitrary: logUniform(1e-20, 1e-5) },
	{ weight: 1, arbitrary: logUniform(10, LAYER_R_MAX) },
	{ weight: 1, arbitrary: fc.constantFrom(0, 1e-6, LAYER_R_MAX) }
);
/** μ or sd for a layer `d` mm thick, within μ ≤ 10⁸ and μ·d ≤ 100 000 m. */
const vapour = (d: number) =>
	fc.oneof(
		{
			weight: 12,
			arbitrary: logUniform(1, Math.min(MU_MAX, (LAYER_SD_MAX * 1000) / d)).map((mu) => ({ mu }))
		},
		{ weight: 6, arbitrary: logUniform(1e-9, LAYER_SD_MAX).map((sd) => ({ sd })) },
		{ weight: 2, arbitrary: fc.constantFrom({ sd: 0 }, { mu: 1 }, { sd: LAYER_SD_MAX }) },
		{ weight: 1, arbitrary: fc.constant({}) } // no vapour data: refused with a climate (kept rare)
	);

const bridge = (d: number) =>
	fc.record({
		lambda: resistance.filter((r) => r > 0).map((r) => d / 1000 / r),
		spacing: fc.oneof(
			fc.double({ min: 1e-6, max: 0.999999, noNaN: true }).map((fraction) => ({ fraction })),
			fc
				.tuple(logUniform(1e-3, BRIDGE_SPACING_MAX_MM), fc.double({ min: 1e-6, max: 0.999, noNaN: true }))
				.map(([centresMm, f]) => ({ widthMm: centresMm * f, centresMm }))
		),
		mu: fc.option(logUniform(1, Math.min(MU_MAX, (LAYER_SD_MAX * 1000) / d)), { nil: undefined })
	});

const fasteners = (d: number) =>
	fc.record({
		lambda: logUniform(1e-3, 1000),
		areaMm2: logUniform(1e-3, 10000),
		perM2: logUniform(1e-3, 10000),
		penetrationMm: fc.option(
			fc.double({ min: 0, max: 1, noNaN: true }).map((f) => Math.max(THICKNESS_MIN_MM, f * d)),
			{ nil: undefined }
		)
	});

/** One layer of a kind: a material by λ, a given resistance, or an air layer of each ventilation. */
const layer = (i: number): fc.Arbitrary<Layer> =>
	fc
		.tuple(
			fc.constantFrom('material', 'material', 'material', 'resistance', 'unventilated', 'slightly', 'well'),
			thickness
		)
		.chain(([kind, d]) => {
			const name = `layer ${i + 1}`;
			if (kind === 'unventilated' || kind === 'slightly' || kind === 'well') {
				const dAir = Math.min(d, 300);
				return fc
					.record({
						vapour: vapour(dAir),
						r: fc.option(resistance, { nil: undefined, freq: 4 }),
						av:
							kind === 'unventilated'
								? fc.option(fc.double({ min: 0, max: 500, noNaN: true }), { nil: undefined })
								: kind === 'slightly'
									? fc.double({ min: 500.001, max: 1500, noNaN: true })
									: fc.option(fc.double({ min: 1500.001, max: 1e6, noNaN: true }), { nil: undefined })
					})
					.map(({ vapour: v, r, av }): Layer => ({
						name,
						thicknessMm: dAir,
						air:
							kind === 'unventilated'
								? 'unventilated'
								: kind === 'slightly'
									? 'slightly-ventilated'
									: 'well-ventilated',
						...(r !== undefined && kind !== 'well' ? { resistance: r } : {}),
						...(av !== undefined ? { openingAreaMm2: av } : {}),
						...(kind === 'well' ? {} : v)
					}));
			}
			return fc
				.record({
					r: resistance,
					v: vapour(d),
					bridge: fc.option(bridge(d), { nil: undefined, freq: 3 }),
					fasteners: fc.option(fasteners(d), { nil: undefined, freq: 5 }),
					airGapLevel: fc.option(fc.constantFrom(0 as const, 1 as const, 2 as const), { nil: undefined })
				})
				.map(({ r, v, bridge: b, fasteners: f, airGapLevel }): Layer => ({
					name,
					thicknessMm: d,
					...(kind === 'resistance' ? { resistance: r } : { lambda: r > 0 ? d / 1000 / r : 1e300 }),
					...v,
					...(b
						? { bridge: { lambda: b.lambda, ...b.spacing, ...(b.mu !== undefined ? { mu: b.mu } : {}) } }
						: {}),
					...(f ? { fasteners: f } : {}),
					...(airGapLevel !== undefined ? { airGapLevel } : {})
				}));
		});

/** Keep what the schema's cross-field rules allow: one slightly ventilated, one well-ventilated (not first), ≤ 8 bridges. */
function tidyLayers(layers: Layer[]): Layer[] {
	let slightly = false;
	let well = false;
	let bridged = 0;
	return layers.map((l, i) => {
		let out = l;
		if (l.air === 'well-ventilated' && (i === 0 || well))
			out = { name: l.name, thicknessMm: l.thicknessMm, air: 'unventilated', mu: 1 };
		if (out.air === 'well-ventilated') well = true;
		if (out.air === 'slightly-ventilated') {
			if (slightly) out = { ...out, air: 'unventilated', openingAreaMm2: undefined };
			slightly = true;
		}
		if (out.bridge && ++bridged > 8) out = { ...out, bridge: undefined };
		return out;
	});
}

const month = (m: number) =>
	fc.record({
		month: fc.constant(m),
		temperature: fc.oneof(
			fc.double({ min: -30, max: 35, noNaN: true }),
			fc.double({ min: -80, max: 80, noNaN: true })
		),
		relativeHumidity: fc.double({ min: 0, max: 100, noNaN: true })
	});
const climate = fc.tuple(...Array.from({ length: 12 }, (_, i) => month(i + 1)));
const internal = fc.record({
	temperature: fc.oneof(
		fc.double({ min: 15, max: 25, noNaN: true }),
		fc.double({ min: -80, max: 80, noNaN: true })
	),
	humidity: fc.oneof(
		fc.double({ min: 1e-9, max: 100, noNaN: true }).map((relativeHumidity) => ({ relativeHumidity })),
		fc.constantFrom(1, 2, 3, 4, 5).map((k) => ({ humidityClass: k as 1 | 2 | 3 | 4 | 5 }))
	)
});
const film = fc.option(
	fc.oneof(fc.constant(0), fc.double({ min: 0, max: 10, noNaN: true }), logUniform(1e-12, 1e-5)),
	{ nil: undefined, freq: 2 }
);

const elementInput: fc.Arbitrary<ElementInput> = fc
	.record({
		heatFlow: fc.constantFrom('upward' as const, 'horizontal' as const, 'downward' as const),
		rsi: film,
		rse: film,
		layers: fc
			.integer({ min: 1, max: 12 })
			.chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => layer(i)))),
		moisture: fc.option(fc.record({ climate, internal }), { nil: undefined, freq: 4 }),
		design: fc.option(
			fc.record({
				internal: fc.double({ min: -80, max: 80, noNaN: true }),
				external: fc.double({ min: -80, max: 80, noNaN: true })
			}),
			{ nil: undefined }
		),
		extra: fc.oneof(
			{ weight: 6, arbitrary: fc.constant({}) },
			{
				weight: 1,
				arbitrary: fc
					.constantFrom(...ROOF_SPACES)
					.map((roofSpace) => ({ roofSpace, heatFlow: 'upward' as const }))
			},
			{
				weight: 1,
				arbitrary: fc
					.record({
						areaM2: logUniform(1e-3, 1e6),
						bPrime: logUniform(1e-3, 1e4),
						groundLambda: fc.option(fc.double({ min: 0.1, max: 10, noNaN: true }), { nil: undefined }),
						wallThicknessM: fc.option(fc.double({ min: 0, max: 3, noNaN: true }), { nil: undefined })
					})
					.map(({ areaM2, bPrime, groundLambda, wallThicknessM }) => ({
						heatFlow: 'downward' as const,
						// P from B′ = A/(0.5·P), kept inside P ≤ 100 000 m
						ground: {
							areaM2,
							perimeterM: Math.min(100000, areaM2 / (0.5 * bPrime)),
							...(groundLambda !== undefined ? { groundLambda } : {}),
							...(wallThicknessM !== undefined ? { wallThicknessM } : {})
						}
					}))
			}
		),
		corrections: fc.option(fc.constantFrom('standard' as const, 'always' as const), { nil: undefined }),
		rounding: fc.option(
			fc.oneof(
				fc.record({ mode: fc.constant('decimals' as const), digits: fc.integer({ min: 0, max: 6 }) }),
				fc.record({ mode: fc.constant('significant' as const), digits: fc.integer({ min: 1, max: 6 }) })
			),
			{ nil: undefined }
		)
	})
	.map((g) => {
		let layers = tidyLayers(g.layers as Layer[]);
		const extra = g.extra as Partial<ElementInput>;
		// a floor on the ground or a roof space: no well-ventilated air layer
		if (extra.ground || extra.roofSpace)
			layers = layers.map((l) =>
				l.air === 'well-ventilated'
					? { ...l, air: 'unventilated' as const, openingAreaMm2: undefined, mu: 1 }
					: l
			);
		const input: ElementInput = {
			heatFlow: g.heatFlow,
			layers,
			...(g.rsi !== undefined ? { rsi: g.rsi } : {}),
			...(g.rse !== undefined ? { rse: g.rse } : {}),
			...(g.moisture
				? {
						climate: g.moisture.climate,
						internal: { temperature: g.moisture.internal.temperature, ...g.moisture.internal.humidity }
					}
				: {}),
			...(g.design ? { designTemperatures: g.design } : {}),
			...(g.corrections ? { corrections: g.corrections } : {}),
			...(g.rounding ? { rounding: g.rounding } : {}),
			...extra
		};
		return input;
	});

describe('every accepted generated input gives a finite, bounded result (fast-check)', () => {
	it(`${RUNS} generated build-ups (seed ${SEED})`, () => {
		let accepted = 0;
		let refused = 0;
		let slowest = 0;
		fc.assert(
			fc.property(elementInput, (input) => {
				const parsed = parseElementInput(input);
				if (!parsed.ok) {
					refused++;
					// a refusal names a field and says what is wrong
					for (const i of parsed.issues) {
						expect(i.path.length).toBeGreaterThan(0);
						expect(i.message.length).toBeGreaterThan(5);
					}
					expect(() => analyseElement(input)).toThrow(ElementInputError);
					return;
				}
				accepted++;
				const t0 = performance.now();
				const r = analyseElement(input);
				const ms = performance.now() - t0;
				slowest = Math.max(slowest, ms);
				expect(ms, 'analysis time, ms').toBeLessThan(BUDGET_MS);
				expect(firstNonFinite(r)).toBeNull();
				expect(r.uValue).toBeGreaterThan(0);
				const { internal: ti, external: te } = r.designTemperatures;
				const lo = Math.min(ti, te) - TOLERANCE_K;
				const hi = Math.max(ti, te) + TOLERANCE_K;
				for (const p of r.interfaces) {
					expect(p.temperature).toBeGreaterThanOrEqual(lo);
					expect(p.temperature).toBeLessThanOrEqual(hi);
				}
				for (const p of r.profile) {
					expect(p.temperature).toBeGreaterThanOrEqual(lo);
					expect(p.temperature).toBeLessThanOrEqual(hi);
				}
				expect(elementResultSchema.safeParse(r).success).toBe(true);
				// the parsed (frozen) input gives the same result as the raw one
				expect(analyseElement(parsed.data)).toStrictEqual(r);
			}),
			{ numRuns: RUNS, seed: SEED }
		);
		// the generator is only useful if it mostly stays within the bounds
		expect(accepted, `accepted ${accepted}, refused ${refused}`).toBeGreaterThan(RUNS / 2);
		console.log(
			`property test: ${accepted} accepted, ${refused} refused, slowest analysis ${slowest.toFixed(1)} ms`
		);
	}, 600_000);
});
