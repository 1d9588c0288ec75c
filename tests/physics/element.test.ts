// The public contract of analyseElement, validation of bad input, and the result schema.
import { describe, expect, it } from 'vitest';
import {
	analyseElement,
	CAUTIONS,
	ElementInputError,
	elementInputSchema,
	elementResultSchema,
	ENGINE_VERSION,
	parseElementInput,
	type ElementInput
} from '../../src/lib/physics';
import { coolClimate, firstNonFinite, lcg } from './helpers';

const wall = (): ElementInput => ({
	heatFlow: 'horizontal',
	layers: [
		{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
		{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 50 },
		{
			name: 'mineral wool between studs',
			thicknessMm: 140,
			lambda: 0.035,
			mu: 1,
			bridge: { lambda: 0.13, widthMm: 38, centresMm: 600, mu: 50 }
		},
		{ name: 'OSB', thicknessMm: 12, lambda: 0.13, mu: 150, airGapLevel: 1 },
		{ name: 'wood fibre board', thicknessMm: 60, lambda: 0.045, mu: 5 },
		{ name: 'ventilated cavity', thicknessMm: 25, air: 'well-ventilated' },
		{ name: 'brick', thicknessMm: 102, lambda: 0.77, mu: 10 }
	],
	internal: { temperature: 20, humidityClass: 3 },
	climate: coolClimate()
});

function issuesOf(raw: unknown) {
	const r = parseElementInput(raw);
	expect(r.ok).toBe(false);
	return r.ok ? [] : r.issues;
}

describe('analyseElement: the contract', () => {
	const r = analyseElement(wall());

	it('returns every field of the contract, all finite, and passes the result schema', () => {
		expect(firstNonFinite(r)).toBeNull();
		expect(elementResultSchema.safeParse(r).success).toBe(true);
		for (const k of ['uValue', 'uValueRounded', 'rTotal', 'deltaU', 'heatFlux'] as const)
			expect(typeof r[k]).toBe('number');
		expect(r.rUpper).toBeGreaterThan(r.rLower!);
		expect(r.interfaces).toHaveLength(wall().layers.length + 1);
		expect(r.surface).toMatchObject({ pass: expect.any(Boolean), criticalMonth: expect.any(Number) });
		expect(r.condensation!.months).toHaveLength(12);
		expect(['none', 'dries', 'accumulates']).toContain(r.condensation!.outcome);
		expect(r.engineVersion).toBe(ENGINE_VERSION);
		expect(r.cautions).toEqual([...CAUTIONS]);
		expect(r.cautions.join(' ')).toMatch(/professional judgement/);
		expect(r.cautions.join(' ')).toMatch(/building codes/);
		expect(r.cautions.join(' ')).toMatch(/steady-state/);
	});

	it('per-layer results carry positions, R, sd and face temperatures', () => {
		const l = r.layers[2];
		expect(l.positionStartMm).toBeCloseTo(12.7, 12);
		expect(l.positionEndMm).toBeCloseTo(152.7, 12);
		expect(l.r).toBeCloseTo(0.14 / 0.035, 12);
		expect(l.bridgeFraction).toBeCloseTo(38 / 600, 12);
		// sd of the bridged layer: parallel vapour paths, 1/((1 − f)/0.14 + f/(50·0.14))
		const f = 38 / 600;
		expect(l.sd!).toBeCloseTo(1 / ((1 - f) / 0.14 + f / 7), 12);
		expect(r.layers[5].disregarded).toBe(true);
		expect(r.layers[1].temperatureInside).toBeCloseTo(r.layers[1].temperatureOutside, 12); // R = 0 membrane
	});

	it('is deterministic and does not modify its input', () => {
		const input = wall();
		const copy = structuredClone(input);
		expect(analyseElement(input)).toEqual(analyseElement(input));
		expect(input).toEqual(copy);
	});

	it('a build-up of one layer with only thermal data gives U and profile, no moisture checks', () => {
		const one = analyseElement({
			heatFlow: 'upward',
			layers: [{ name: 'slab', thicknessMm: 200, lambda: 2.0 }]
		});
		expect(one.uValue).toBeCloseTo(1 / (0.1 + 0.1 + 0.04), 12);
		expect(one.surface).toBeUndefined();
		expect(one.condensation).toBeUndefined();
		expect(firstNonFinite(one)).toBeNull();
	});
});

describe('validation names the field and never yields NaN', () => {
	it('no layers', () => {
		expect(issuesOf({ heatFlow: 'horizontal', layers: [] })).toEqual([
			{ path: 'layers', message: 'at least one layer is required' }
		]);
	});

	it('thickness ≤ 0, λ ≤ 0, NaN', () => {
		const issues = issuesOf({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'a', thicknessMm: 100, lambda: 0.04 },
				{ name: 'b', thicknessMm: 0, lambda: 0.04 },
				{ name: 'c', thicknessMm: 10, lambda: -1 },
				{ name: 'd', thicknessMm: Number.NaN, lambda: 1 }
			]
		});
		expect(issues).toContainEqual({ path: 'layers.1.thicknessMm', message: 'must be > 0' });
		expect(issues).toContainEqual({ path: 'layers.2.lambda', message: 'must be > 0' });
		expect(issues).toContainEqual({
			path: 'layers.3.thicknessMm',
			message: 'must be a finite number, got NaN'
		});
	});

	it('a bridging fraction outside (0, 1)', () => {
		for (const fraction of [0, 1, 1.5, -0.1]) {
			const issues = issuesOf({
				heatFlow: 'horizontal',
				layers: [{ name: 'a', thicknessMm: 100, lambda: 0.04, bridge: { lambda: 0.13, fraction } }]
			});
			expect(issues).toEqual([
				{ path: 'layers.0.bridge.fraction', message: 'must be between 0 and 1 (exclusive)' }
			]);
		}
		expect(
			issuesOf({
				heatFlow: 'horizontal',
				layers: [
					{
						name: 'a',
						thicknessMm: 100,
						lambda: 0.04,
						bridge: { lambda: 0.13, widthMm: 600, centresMm: 600 }
					}
				]
			})
		).toEqual([{ path: 'layers.0.bridge.widthMm', message: 'must be smaller than centresMm' }]);
	});

	it('11 climate months, a repeated month, a month out of range', () => {
		const base = wall();
		expect(issuesOf({ ...base, climate: base.climate!.slice(0, 11) })).toEqual([
			{ path: 'climate', message: '12 months are required, got 11' }
		]);
		const twice = base.climate!.map((m) => ({ ...m }));
		twice[4].month = 4;
		expect(issuesOf({ ...base, climate: twice })).toEqual([
			{ path: 'climate.4.month', message: 'month 4 is given twice (also at climate.3)' }
		]);
		const bad = base.climate!.map((m) => ({ ...m }));
		bad[2].month = 13;
		bad[5].relativeHumidity = 120;
		const issues = issuesOf({ ...base, climate: bad });
		expect(issues).toContainEqual({ path: 'climate.2.month', message: 'must be 1–12' });
		expect(issues).toContainEqual({ path: 'climate.5.relativeHumidity', message: 'must be 0–100 %' });
	});

	it('missing λ and resistance, missing μ with a climate, missing internal conditions, bad heat flow', () => {
		expect(issuesOf({ heatFlow: 'horizontal', layers: [{ name: 'a', thicknessMm: 100 }] })).toEqual([
			{ path: 'layers.0.lambda', message: 'give λ or the thermal resistance' }
		]);
		const noMu = wall();
		delete noMu.layers[3].mu;
		expect(issuesOf(noMu)).toEqual([
			{ path: 'layers.3.mu', message: 'give μ or sd for the condensation check' }
		]);
		const noInternal = wall();
		delete noInternal.internal;
		expect(issuesOf(noInternal)).toEqual([
			{ path: 'internal', message: 'internal conditions are required with a climate' }
		]);
		expect(issuesOf({ ...wall(), heatFlow: 'sideways' })).toEqual([
			{ path: 'heatFlow', message: 'must be upward, horizontal or downward' }
		]);
	});

	it('air layers: thickness over the table, opening areas that contradict the kind', () => {
		const layer = (l: object) => ({
			heatFlow: 'horizontal',
			layers: [
				{ name: 'wall', thicknessMm: 100, lambda: 0.5 },
				{ name: 'air', ...l }
			]
		});
		expect(issuesOf(layer({ thicknessMm: 350, air: 'unventilated' }))[0].path).toBe('layers.1.thicknessMm');
		expect(issuesOf(layer({ thicknessMm: 50, air: 'slightly-ventilated' }))).toEqual([
			{ path: 'layers.1.openingAreaMm2', message: 'is required for a slightly ventilated air layer' }
		]);
		expect(issuesOf(layer({ thicknessMm: 50, air: 'unventilated', openingAreaMm2: 800 }))[0].path).toBe(
			'layers.1.openingAreaMm2'
		);
		expect(
			issuesOf({
				heatFlow: 'horizontal',
				layers: [{ name: 'air', thicknessMm: 50, air: 'well-ventilated' }]
			})[0].path
		).toBe('layers.0.air');
	});

	it('analyseElement throws ElementInputError with the same issues, and a readable message', () => {
		let caught: unknown;
		try {
			analyseElement({ heatFlow: 'horizontal', layers: [{ name: 'a', thicknessMm: -5, lambda: 0.04 }] });
		} catch (e) {
			caught = e;
		}
		expect(caught).toBeInstanceOf(ElementInputError);
		expect((caught as ElementInputError).issues).toEqual([
			{ path: 'layers.0.thicknessMm', message: 'must be > 0' }
		]);
		expect((caught as Error).message).toBe('layers.0.thicknessMm: must be > 0');
	});

	it('accepts what it produces: a valid input parses unchanged', () => {
		const input = wall();
		const r = parseElementInput(input);
		expect(r.ok).toBe(true);
		if (r.ok) expect(r.data).toEqual(input);
		expect(elementInputSchema.safeParse(input).success).toBe(true);
	});
});

describe('no NaN or Infinity in any result (randomised valid inputs)', () => {
	it('400 random build-ups, climates and internal conditions', () => {
		const rnd = lcg(4242);
		const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
		let analysed = 0;
		for (let trial = 0; trial < 400; trial++) {
			const n = 1 + Math.floor(rnd() * 8);
			const layers: ElementInput['layers'] = [];
			for (let i = 0; i < n; i++) {
				const kind = rnd();
				const thicknessMm = pick([0.2, 5, 12.5, 25, 50, 100, 140, 300]);
				const vapour = rnd() < 0.5 ? { mu: 1 + rnd() * 200 } : { sd: pick([0, 0.01, 0.5, 20, 1500]) };
				if (kind < 0.15 && thicknessMm <= 300)
					layers.push({ name: `air ${i}`, thicknessMm, air: 'unventilated' });
				else if (kind < 0.25) layers.push({ name: `membrane ${i}`, thicknessMm, resistance: 0, ...vapour });
				else if (kind < 0.4)
					layers.push({
						name: `bridged ${i}`,
						thicknessMm,
						lambda: 0.02 + rnd() * 0.2,
						bridge: { lambda: pick([0.13, 0.5, 50]), fraction: 0.01 + rnd() * 0.5 },
						...vapour
					});
				else
					layers.push({
						name: `layer ${i}`,
						thicknessMm,
						lambda: 0.02 + rnd() * 2,
						airGapLevel: pick([0, 1, 2] as const),
						...vapour
					});
			}
			if (n > 2 && rnd() < 0.2)
				layers.splice(n - 1, 0, { name: 'vent', thicknessMm: 25, air: 'well-ventilated' });
			const climate = Array.from({ length: 12 }, (_, i) => ({
				month: i + 1,
				temperature: -25 + rnd() * 55,
				relativeHumidity: pick([0, 40, 80, 95, 100])
			}));
			const internal =
				rnd() < 0.5
					? { temperature: 10 + rnd() * 15, humidityClass: pick([1, 2, 3, 4, 5] as const) }
					: { temperature: 10 + rnd() * 15, relativeHumidity: pick([1, 30, 60, 100]) };
			const input: ElementInput = {
				heatFlow: pick(['upward', 'horizontal', 'downward'] as const),
				layers,
				internal,
				climate
			};
			const parsed = parseElementInput(input);
			if (!parsed.ok) continue; // e.g. a zero total sd: rejected with a message, which is also fine
			const r = analyseElement(input);
			analysed++;
			expect(firstNonFinite(r), JSON.stringify(input)).toBeNull();
			expect(elementResultSchema.safeParse(r).success).toBe(true);
		}
		expect(analysed).toBeGreaterThan(300);
	});

	it('a build-up of zero total resistance is refused with a message, not a division by zero', () => {
		expect(() =>
			analyseElement({
				heatFlow: 'horizontal',
				rsi: 0,
				rse: 0,
				layers: [{ name: 'foil', thicknessMm: 0.1, resistance: 0 }]
			})
		).toThrow(/total thermal resistance is zero/);
	});
});
