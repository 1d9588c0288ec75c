// Monthly interstitial condensation by the Glaser method (ISO 13788:2012 clause 6, as read from
// memory). No worked example of the standard is reproduced: we do not recall its numbers reliably.
// Instead: a hand calculation shown in full, an independent brute-force reference of the method
// (tests/physics/helpers.ts: closed-form temperatures, extreme-point hull, slope differences) and
// mass-balance checks. Climates and build-ups here are constructed inputs, not real sites.
import { describe, expect, it } from 'vitest';
import { analyseElement, type ElementInput, type ElementResult } from '../../src/lib/physics';
import {
	coldClimate,
	constantClimate,
	coolClimate,
	psatRef,
	referenceGlaser,
	type RefLayer
} from './helpers';

type C = NonNullable<ElementResult['condensation']>;

const DAYS = [31, 28, 31, 30, 31, 30, 31, 31, 30, 31, 30, 31];

/** Months for the reference, with pi from a fixed RH or a humidity class (ISO 13788 Annex A, from memory). */
function refMonths(input: ElementInput) {
	const excess = { 1: 270, 2: 540, 3: 810, 4: 1080, 5: 1350 } as const;
	const internal = input.internal!;
	return input.climate!.map((c) => {
		const pe = (c.relativeHumidity / 100) * psatRef(c.temperature);
		const dp = internal.humidityClass
			? excess[internal.humidityClass] * Math.min(1, Math.max(0, 1 - c.temperature / 20))
			: 0;
		const pi = internal.humidityClass
			? pe + 1.1 * dp
			: (internal.relativeHumidity! / 100) * psatRef(internal.temperature);
		return { month: c.month, te: c.temperature, pe, ti: internal.temperature, pi };
	});
}

/** Reference layers: R = d/λ (or given R), sd = μ·d (or given sd). */
function refLayers(input: ElementInput): RefLayer[] {
	return input.layers.map((l) => ({
		thicknessMm: l.thicknessMm,
		r: l.resistance ?? l.thicknessMm / 1000 / l.lambda!,
		sd: l.sd ?? ((l.mu ?? 1) * l.thicknessMm) / 1000
	}));
}

function compareWithReference(input: ElementInput, c: C) {
	const ref = referenceGlaser(refLayers(input), 0.13, 0.04, refMonths(input));
	expect(c.startMonth).toBe(ref.start);
	expect(c.nodes.map((n) => n.sdM)).toHaveLength(ref.x.length);
	c.nodes.forEach((n, g) => expect(n.sdM).toBeCloseTo(ref.x[g], 12));
	for (let m = 0; m < 12; m++) {
		const mine = c.months[m];
		for (let g = 0; g < ref.x.length; g++) {
			expect(Math.abs(mine.accumulatedAt[g] - ref.accumulated[m][g])).toBeLessThan(
				1e-6 * (1 + ref.accumulated[m][g])
			);
			expect(Math.abs(mine.rate[g] - ref.rates[m][g])).toBeLessThan(1e-6 * (1 + Math.abs(ref.rates[m][g])));
		}
	}
}

/** Mass balance of each month: what enters at the inside minus what leaves at the outside = Σ rates. */
function checkMassBalance(c: C) {
	const last = c.nodes.length - 1;
	for (const m of c.months) {
		const secs = m.days * 86400;
		const fin = (2e-10 * (m.vapourPressure[0] - m.vapourPressure[1])) / (c.nodes[1].sdM - c.nodes[0].sdM);
		const fout =
			(2e-10 * (m.vapourPressure[last - 1] - m.vapourPressure[last])) /
			(c.nodes[last].sdM - c.nodes[last - 1].sdM);
		const sumRates = m.rate.reduce((a, b) => a + b, 0);
		expect(Math.abs((fin - fout) * secs * 1000 - sumRates)).toBeLessThan(1e-6 * (1 + Math.abs(sumRates)));
		// vapour pressure never exceeds saturation inside the element
		for (let g = 1; g < last; g++)
			expect(m.vapourPressure[g]).toBeLessThanOrEqual(m.saturationPressure[g] * (1 + 1e-9));
		for (const a of m.accumulatedAt) expect(a).toBeGreaterThanOrEqual(0);
	}
	// month to month: end = start + condensed − evaporated, in cycle order
	const order = Array.from({ length: 12 }, (_, i) => ((c.startMonth ?? 1) - 1 + i) % 12);
	let prev = 0;
	for (const i of order) {
		const m = c.months[i];
		expect(m.accumulated).toBeCloseTo(prev + m.condensed - m.evaporated, 6);
		prev = m.accumulated;
	}
}

describe('Glaser: zero-resistance membrane with a large sd, hand calculation', () => {
	// Rsi 0.13 | mineral wool 100 mm, λ 0.04 (R 2.5), μ 1 (sd 0.1 m) | membrane R = 0, sd 10 m | Rse 0.04
	// Inside 20 °C / 50 %, outside 0 °C / 80 % in every month.
	// RT = 2.67. Membrane faces: θ = 20 − 20·(0.13 + 2.5)/2.67 = 0.299625 °C, psat = 623.941 Pa.
	// pi = 0.5·2336.951 = 1168.476 Pa; pe = 0.8·610.5 = 488.4 Pa.
	// Straight line at sd 0.1 m: 1168.48 − 680.08·0.1/10.1 = 1161.7 Pa > 623.9 → condensation there.
	// g_in = 2e-10·(1168.476 − 623.941)/0.1 = 1.0890697e-6; g_out = 2e-10·(623.941 − 488.4)/10 = 2.7108e-9
	// gc = 1.0863588e-6 kg/(m²·s) → January (31 d) 2909.70 g/m², February (28 d) 2628.12 g/m².
	const input: ElementInput = {
		heatFlow: 'horizontal',
		layers: [
			{ name: 'mineral wool', thicknessMm: 100, lambda: 0.04, mu: 1 },
			{ name: 'membrane', thicknessMm: 0.2, resistance: 0, sd: 10 }
		],
		internal: { temperature: 20, relativeHumidity: 50 },
		climate: constantClimate(0, 80)
	};
	const r = analyseElement(input);
	const c = r.condensation!;

	it('condenses at the inner face of the membrane at the hand-calculated rate', () => {
		const g = c.nodes.findIndex((n) => Math.abs(n.sdM - 0.1) < 1e-12);
		expect(c.nodes[g].kind).toBe('interface');
		expect(c.nodes[g].positionMm).toBe(100);
		expect(c.months[0].temperature[g]).toBeCloseTo(0.299625, 6);
		expect(c.months[0].saturationPressure[g]).toBeCloseTo(623.941, 3);
		expect(c.months[0].rate[g]).toBeCloseTo(2909.7, 1);
		expect(c.months[1].rate[g]).toBeCloseTo(2628.12, 1);
		expect(c.months[0].vapourPressure[g]).toBeCloseTo(623.941, 3);
		// only that interface condenses
		expect(c.months[0].rate.filter((x) => x !== 0)).toHaveLength(1);
	});

	it('condensation in every month: starts in month 1 and accumulates', () => {
		expect(c.condensesEveryMonth).toBe(true);
		expect(c.startMonth).toBe(1);
		expect(c.outcome).toBe('accumulates');
		expect(c.evaporatesFully).toBe(false);
		// a full year: gc·365 d = 34259.4 g/m²
		expect(c.months[11].accumulated).toBeCloseTo(34259.4, 0);
		expect(c.maxAccumulation).toBeCloseTo(34259.4, 0);
		expect(c.peakMonth).toBe(12);
		expect(c.condensationMonths).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12]);
		expect(c.acceptance.pass).toBe(false);
		checkMassBalance(c);
	});

	it('the same build-up without the membrane stays dry', () => {
		const dry = analyseElement({ ...input, layers: [input.layers[0]] });
		expect(dry.condensation!.outcome).toBe('none');
		expect(dry.condensation!.startMonth).toBeNull();
		expect(dry.condensation!.maxAccumulation).toBe(0);
		expect(dry.condensation!.acceptance.pass).toBe(true);
	});
});

describe('Glaser against the independent reference', () => {
	it('a condensation zone inside a thick insulation layer (contacts at sublayer nodes)', () => {
		const input: ElementInput = {
			heatFlow: 'horizontal',
			layers: [
				{ name: 'board', thicknessMm: 15, lambda: 0.13, sd: 0.05 },
				{ name: 'mineral wool', thicknessMm: 300, lambda: 0.04, mu: 1 } // R 7.5 → 30 sublayers
			],
			internal: { temperature: 20, relativeHumidity: 65 },
			climate: coldClimate()
		};
		const c = analyseElement(input).condensation!;
		const jan = c.months[0];
		const wet = jan.rate.map((x, g) => (x > 0 ? g : -1)).filter((g) => g >= 0);
		expect(wet.length).toBeGreaterThanOrEqual(2);
		for (const g of wet) {
			expect(c.nodes[g].kind).toBe('sublayer');
			expect(c.nodes[g].layerIndex).toBe(1);
			expect(jan.vapourPressure[g]).toBeCloseTo(jan.saturationPressure[g], 9);
		}
		expect(c.startMonth).toBe(1);
		expect(c.outcome).toBe('dries');
		compareWithReference(input, c);
		checkMassBalance(c);
	});

	const twoPlanes: ElementInput = {
		heatFlow: 'horizontal',
		layers: [
			{ name: 'plasterboard', thicknessMm: 12.5, lambda: 0.21, mu: 10 },
			{ name: 'mineral wool A', thicknessMm: 100, lambda: 0.04, mu: 1 },
			{ name: 'board', thicknessMm: 12, lambda: 0.13, sd: 1 },
			{ name: 'mineral wool B', thicknessMm: 100, lambda: 0.04, mu: 1 },
			{ name: 'outer board', thicknessMm: 12, lambda: 0.13, sd: 3 }
		],
		internal: { temperature: 20, humidityClass: 4 },
		climate: coolClimate()
	};

	it('two condensation interfaces in the same month', () => {
		const c = analyseElement(twoPlanes).condensation!;
		const jan = c.months[0];
		const wet = jan.rate.map((x, g) => (x > 0 ? g : -1)).filter((g) => g >= 0);
		expect(wet).toHaveLength(2);
		expect(wet.map((g) => c.nodes[g].positionMm)).toEqual([112.5, 224.5]);
		expect(wet.map((g) => c.nodes[g].kind)).toEqual(['interface', 'interface']);
		compareWithReference(twoPlanes, c);
		checkMassBalance(c);
	});

	it('a month in which one interface dries while another wets', () => {
		const c = analyseElement(twoPlanes).condensation!;
		const inner = c.nodes.findIndex((n) => n.positionMm === 112.5);
		const outer = c.nodes.findIndex((n) => n.positionMm === 224.5);
		// April: the inner plane evaporates (still wet), the outer one still gains
		const apr = c.months[3];
		expect(apr.rate[inner]).toBeLessThan(0);
		expect(apr.accumulatedAt[inner]).toBeGreaterThan(0);
		expect(apr.rate[outer]).toBeGreaterThan(0);
		// July: the inner plane dries out completely while the outer one still gains a little
		const jul = c.months[6];
		expect(jul.accumulatedAt[inner]).toBe(0);
		expect(-jul.rate[inner]).toBeGreaterThan(c.months[5].accumulatedAt[inner]); // more could evaporate than was left
		expect(jul.evaporated).toBeCloseTo(c.months[5].accumulatedAt[inner], 6);
		expect(jul.rate[outer]).toBeGreaterThan(0);
		// the outer plane does not dry within the year: the construction accumulates
		expect(c.outcome).toBe('accumulates');
		expect(c.startMonth).toBe(9);
		expect(c.months[7].accumulatedAt[outer]).toBeGreaterThan(0); // August, the last month of the cycle
	});

	it('starts in the first month with condensation after one without, and dries out', () => {
		const input: ElementInput = {
			heatFlow: 'horizontal',
			layers: [
				{ name: 'plaster', thicknessMm: 15, lambda: 0.7, mu: 10 },
				{ name: 'mineral wool', thicknessMm: 200, lambda: 0.04, mu: 1 },
				{ name: 'render', thicknessMm: 10, lambda: 0.8, sd: 0.05 }
			],
			internal: { temperature: 20, humidityClass: 4 },
			climate: coolClimate()
		};
		const c = analyseElement(input).condensation!;
		expect(c.startMonth).toBe(11);
		expect(c.months[10].accumulated).toBeCloseTo(c.months[10].condensed, 9); // the cycle starts dry
		expect(c.condensationMonths).toEqual([1, 2, 11, 12]);
		expect(c.outcome).toBe('dries');
		expect(c.evaporatesFully).toBe(true);
		expect(c.peakMonth).toBe(2);
		expect(c.maxAccumulation).toBeCloseTo(c.months[1].accumulated, 9);
		// the peak month is also the month charted
		expect(c.vapourProfile.month).toBe(1); // most condensation formed in January
		expect(c.vapourProfile.points.length).toBeGreaterThan(c.nodes.length - 1);
		compareWithReference(input, c);
		checkMassBalance(c);
		// acceptance limits are configurable
		const limited = analyseElement({ ...input, moistureLimits: { maxAtInterfaceGm2: 500 } }).condensation!;
		expect(limited.acceptance.pass).toBe(false);
		expect(limited.acceptance.reasons.join(' ')).toMatch(/exceeds the limit of 500/);
		const lenient = analyseElement({
			...input,
			moistureLimits: { maxAtInterfaceGm2: 10000, maxTotalGm2: 10000 }
		}).condensation!;
		expect(lenient.acceptance.pass).toBe(true);
	});

	it('month lengths weight the amounts (ISO 13788:2012 clause 6, from memory)', () => {
		const c = analyseElement(twoPlanes).condensation!;
		c.months.forEach((m, i) => expect(m.days).toBe(DAYS[i]));
	});

	it('a vapour control layer on the warm side keeps the same wall free of condensation', () => {
		const withVcl: ElementInput = {
			...twoPlanes,
			internal: { temperature: 20, relativeHumidity: 50 },
			layers: [
				twoPlanes.layers[0],
				{ name: 'vapour control layer', thicknessMm: 0.2, resistance: 0, sd: 100 },
				...twoPlanes.layers.slice(1)
			]
		};
		const r = analyseElement(withVcl);
		expect(r.condensation!.outcome).toBe('none');
		expect(r.condensation!.condensationMonths).toEqual([]);
		checkMassBalance(r.condensation!);
	});
});
