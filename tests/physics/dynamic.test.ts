// ISO 13786:2017 dynamic thermal characteristics (heat transfer matrices of plane homogeneous
// layers). The standard's formulas are quoted FROM MEMORY in the engine. Checked here against:
// - an independent implementation in Python/numpy (tests/physics/reference/iso13786.py), which
//   solves the periodic heat equation with numpy's complex cosh/sinh of k·d, k = √(iωρc/λ), instead
//   of the standard's expanded real and imaginary parts, and multiplies with numpy.matmul;
// - closed-form limits derived by hand from the same heat equation (shown beside each check): a
//   very thin layer, a semi-infinite solid, reciprocity and symmetry.
// No worked example of the standard's annex is reproduced: its numbers are not recalled reliably.
// The build-ups are invented; their material values are of the usual order (common practice, no source).
import { describe, expect, it } from 'vitest';
import {
	analyseDynamic,
	DYNAMIC_XI_TOTAL_MAX,
	parseDynamicInput,
	type DynamicInput,
	type DynamicResult
} from '../../src/lib/physics/dynamic';
import { CalculationInputError } from '../../src/lib/physics/calc-parse';
import { numpyVersion, referenceTitle, runReference } from './reference/python';

const plaster = { name: 'gypsum plaster', thicknessMm: 15, lambda: 0.57, density: 1300, specificHeat: 1000 };
const brick = { name: 'solid brick', thicknessMm: 240, lambda: 0.77, density: 1800, specificHeat: 840 };
const eps = { name: 'EPS board', thicknessMm: 120, lambda: 0.035, density: 20, specificHeat: 1450 };
const render = { name: 'render', thicknessMm: 10, lambda: 1.0, density: 1800, specificHeat: 1000 };
const board = { name: 'plasterboard', thicknessMm: 12.5, lambda: 0.25, density: 900, specificHeat: 1000 };
const wool = { name: 'mineral wool', thicknessMm: 160, lambda: 0.035, density: 30, specificHeat: 1030 };
const osb = { name: 'OSB', thicknessMm: 15, lambda: 0.13, density: 600, specificHeat: 1700 };
const cavity = { name: 'air layer', resistance: 0.18 };
const cladding = {
	name: 'fibre-cement board',
	thicknessMm: 8,
	lambda: 0.6,
	density: 1700,
	specificHeat: 1000
};
const concrete = (thicknessMm: number) => ({
	name: 'concrete',
	thicknessMm,
	lambda: 2.0,
	density: 2400,
	specificHeat: 1000
});
const pir = { name: 'PIR board', thicknessMm: 140, lambda: 0.022, density: 30, specificHeat: 1400 };
const membrane = {
	name: 'bitumen membrane',
	thicknessMm: 5,
	lambda: 0.23,
	density: 1100,
	specificHeat: 1000
};
const soil = { name: 'moist soil', thicknessMm: 3000, lambda: 1.5, density: 1800, specificHeat: 1300 };

/** Every field given, as the reference needs it (it has no defaults). */
type Full = Required<Pick<DynamicInput, 'rsi' | 'rse' | 'periodH'>> & DynamicInput;
const cases: Full[] = [
	{ layers: [plaster, brick, eps, render], rsi: 0.13, rse: 0.04, periodH: 24 },
	{ layers: [board, wool, osb, cavity, cladding], rsi: 0.13, rse: 0.04, periodH: 24 },
	{ layers: [concrete(200), pir, membrane], rsi: 0.1, rse: 0.04, periodH: 24 },
	{ layers: [concrete(200)], rsi: 0.13, rse: 0.04, periodH: 1 },
	{ layers: [soil], rsi: 0, rse: 0, periodH: 8760 },
	{ layers: [board, { resistance: 0.17 }, board], rsi: 0.13, rse: 0.13, periodH: 24 },
	{ layers: [concrete(600), eps, concrete(80)], rsi: 0.13, rse: 0.04, periodH: 12 }
];

interface Reference {
	z: [number, number][];
	y12: [number, number];
	y11: [number, number];
	y22: [number, number];
	kappa1: number;
	kappa2: number;
	u: number;
	layers: { delta: number | null; xi: number }[];
}

/** Paths of every number in `v` that is not finite. */
function nonFinite(v: unknown, path = ''): string[] {
	if (typeof v === 'number') return Number.isFinite(v) ? [] : [path];
	if (typeof v !== 'object' || v === null) return [];
	return Object.entries(v).flatMap(([k, x]) => nonFinite(x, `${path}.${k}`));
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);
/** Relative distance of two complex numbers, |a − b|/|b|. */
const relC = (a: { re: number; im: number }, [re, im]: [number, number]) =>
	Math.hypot(a.re - re, a.im - im) / Math.hypot(re, im);

describe.skipIf(!numpyVersion)(
	`ISO 13786 against an independent Python/numpy implementation (${referenceTitle})`,
	() => {
		const ref = numpyVersion ? runReference<{ results: Reference[] }>('iso13786.py', { cases }).results : [];

		it.each(cases.map((c, i) => [i, c] as const))('build-up %i agrees to 1e-9 relative', (i, input) => {
			const r = analyseDynamic(input);
			const p = ref[i];
			const z = [r.z.m11, r.z.m12, r.z.m21, r.z.m22];
			z.forEach((entry, k) => expect(relC(entry, p.z[k])).toBeLessThan(1e-9));
			expect(relC(r.y12.value, p.y12)).toBeLessThan(1e-9);
			expect(relC(r.y11.value, p.y11)).toBeLessThan(1e-9);
			expect(relC(r.y22.value, p.y22)).toBeLessThan(1e-9);
			expect(rel(r.kappa1, p.kappa1)).toBeLessThan(1e-9);
			expect(rel(r.kappa2, p.kappa2)).toBeLessThan(1e-9);
			expect(rel(r.u, p.u)).toBeLessThan(1e-12);
			expect(rel(r.decrementFactor, Math.hypot(...p.y12) / p.u)).toBeLessThan(1e-9);
			// time shift Δt = T·arg(Y12)/(2π), to 1e-9 of the period
			const shift = (input.periodH * Math.atan2(p.y12[1], p.y12[0])) / (2 * Math.PI);
			expect(Math.abs(r.y12.timeShiftH - shift)).toBeLessThan(1e-9 * input.periodH);
			r.layers.forEach((l, k) => {
				expect(l.xi === 0 ? p.layers[k].xi : rel(l.xi, p.layers[k].xi)).toBeLessThan(1e-12);
				if (l.delta !== null) expect(rel(l.delta, p.layers[k].delta!)).toBeLessThan(1e-12);
			});
		});
	}
);

describe('ISO 13786 closed-form limits (hand derivations from the periodic heat equation)', () => {
	const cap = (r: DynamicResult) => r.layers.reduce((s, l) => s + l.heatCapacity, 0);

	it('a very thin layer: Y12 → U, f → 1, no time shift; κ1 + κ2 → ρ·c·d, shared as the surface resistances', () => {
		// 0.01 mm of λ 1, ρ 1000, c 1000: δ = √(86400/(π·10⁶)) = 0.166 m, ξ = 6·10⁻⁵; C = ρcd = 10 J/(m²·K)
		const r = analyseDynamic({
			layers: [{ thicknessMm: 0.01, lambda: 1, density: 1000, specificHeat: 1000 }]
		});
		expect(r.u).toBeCloseTo(1 / (0.13 + 0.00001 + 0.04), 12);
		expect(rel(r.y12.modulus, r.u)).toBeLessThan(1e-6);
		expect(Math.abs(r.decrementFactor - 1)).toBeLessThan(1e-6);
		expect(Math.abs(r.y12.timeShiftH)).toBeLessThan(1e-3);
		expect(r.y12.timeLagH).toBeLessThan(1e-3);
		// both environments swinging together fill the layer's capacity C = 0.01 kJ/(m²·K); to first
		// order in ω·R·C each side supplies the share of its surface conductance:
		// κ1 = C·Rse/(Rsi + Rse) = 0.01·0.04/0.17, κ2 = C·Rsi/(Rsi + Rse) = 0.01·0.13/0.17
		expect(rel(r.kappa1 + r.kappa2, 0.01)).toBeLessThan(1e-6);
		expect(rel(r.kappa1, (0.01 * 0.04) / 0.17)).toBeLessThan(1e-4);
		expect(rel(r.kappa2, (0.01 * 0.13) / 0.17)).toBeLessThan(1e-4);
		expect(rel(cap(r), 0.01)).toBeLessThan(1e-12);
	});

	it('a thin heavy lining inside thick insulation holds nearly all its ρ·c·d as internal capacity κ1', () => {
		// 0.1 mm of concrete (C = 2400·1000·0.0001 = 240 J/(m²·K)) inside R = 5 m²·K/W of insulation (no
		// capacity): to first order κ1 = C·(R + Rse)/(Rsi + R + Rse) = 0.24·5.04/5.17 kJ/(m²·K) and
		// κ2 = C·Rsi/(Rsi + R + Rse) = 0.24·0.13/5.17; second-order terms are of ω·C·Rsi ≈ 0.002
		const r = analyseDynamic({ layers: [concrete(0.1), { resistance: 5 }] });
		expect(rel(r.kappa1, (0.24 * 5.04) / 5.17)).toBeLessThan(0.002);
		expect(rel(r.kappa2, (0.24 * 0.13) / 5.17)).toBeLessThan(0.002);
		expect(r.kappa1).toBeGreaterThan(0.97 * 0.24); // ≈ ρ·c·d
	});

	it('a massive layer: f is small and |Y12| follows the thick-slab asymptote 2√2·(λ/δ)·e^(−ξ)', () => {
		// With Rsi = Rse = 0 and sinh ξ ≈ cosh ξ ≈ e^ξ/2: |Z12| = δ·e^ξ/(2√2·λ); error of order e^(−2ξ)
		// 1.5 m of concrete: δ = √(2·86400/(π·2.4·10⁶)) = 0.1514 m, ξ = 9.91
		const r = analyseDynamic({ layers: [concrete(1500)], rsi: 0, rse: 0 });
		const { delta, xi } = r.layers[0];
		expect(xi).toBeCloseTo(1.5 / Math.sqrt((2 * 86400) / (Math.PI * 2.4e6)), 12);
		expect(rel(r.y12.modulus, (2 * Math.SQRT2 * 2.0 * Math.exp(-xi)) / delta!)).toBeLessThan(1e-7);
		// f = |Y12|·RT = 2√2·(2/0.1514)·e^(−9.91)·0.75 = 0.0014
		expect(r.decrementFactor).toBeCloseTo(0.00139, 5);
		// with the surface resistances the wall damps the daily swing further
		expect(analyseDynamic({ layers: [concrete(1500)] }).decrementFactor).toBeLessThan(0.001);
	});

	it('a semi-infinite solid: admittance √(iωλρc) = (1 + i)·λ/δ, leading by T/8', () => {
		// θ'' = (iωρc/λ)·θ decays into the solid: q/θ at the surface = λ·√(iωρc/λ) = √(iωλρc)
		const r = analyseDynamic({ layers: [concrete(3000)], rsi: 0, rse: 0 });
		const lambdaOverDelta = 2.0 / r.layers[0].delta!;
		expect(rel(r.y11.value.re, lambdaOverDelta)).toBeLessThan(1e-9);
		expect(rel(r.y11.value.im, lambdaOverDelta)).toBeLessThan(1e-9);
		expect(r.y11.timeShiftH).toBeCloseTo(3, 9); // T/8 of 24 h
		// the areal heat capacity tends to √(λρc/ω) = ρ·c·δ/√2 (the same surface response over ω); the
		// "− 1" of (Z11 − 1) is a correction of order 1/|Z11| ≈ 2·e^(−ξ), ξ = 3/0.1514 = 19.8
		const omega = (2 * Math.PI) / 86400;
		expect(rel(r.kappa1, Math.sqrt((2.0 * 2400 * 1000) / omega) / 1000)).toBeLessThan(1e-7);
	});

	it('reciprocity and symmetry: det Z = 1; turning the build-up round keeps Y12 and swaps Y11 with Y22', () => {
		// every layer and surface matrix has determinant 1 (cosh² − sinh² of kd), hence their product
		const input = { layers: [plaster, brick, eps, render], rsi: 0.13, rse: 0.13 };
		const r = analyseDynamic(input);
		const { m11, m12, m21, m22 } = r.z;
		const det = {
			re: m11.re * m22.re - m11.im * m22.im - (m12.re * m21.re - m12.im * m21.im),
			im: m11.re * m22.im + m11.im * m22.re - (m12.re * m21.im + m12.im * m21.re)
		};
		expect(Math.hypot(det.re - 1, det.im) / Math.hypot(m11.re, m11.im) ** 2).toBeLessThan(1e-12);
		const back = analyseDynamic({ ...input, layers: [...input.layers].reverse() });
		expect(relC(back.y12.value, [r.y12.value.re, r.y12.value.im])).toBeLessThan(1e-12);
		expect(relC(back.y11.value, [r.y22.value.re, r.y22.value.im])).toBeLessThan(1e-12);
		expect(rel(back.kappa1, r.kappa2)).toBeLessThan(1e-12);
		// a symmetric build-up with equal surface resistances has equal admittances
		const sym = analyseDynamic({ layers: [board, cavity, board], rsi: 0.13, rse: 0.13 });
		expect(relC(sym.y11.value, [sym.y22.value.re, sym.y22.value.im])).toBeLessThan(1e-12);
	});

	it('a long period tends to the steady state: Y12 → U', () => {
		const r = analyseDynamic({ layers: [board, wool, osb], periodH: 8760 });
		expect(rel(r.y12.modulus, r.u)).toBeLessThan(1e-3);
	});

	it('a layer without heat capacity is the resistance matrix [[1, −R], [0, 1]]', () => {
		const r = analyseDynamic({ layers: [{ resistance: 2 }], rsi: 0.13, rse: 0.04 });
		expect(r.z.m12).toEqual({ re: -2.17, im: 0 });
		expect(r.z.m21).toEqual({ re: 0, im: 0 });
		expect(r.y12.modulus).toBeCloseTo(1 / 2.17, 14);
		expect(r.kappa1).toBe(0);
		expect(r.decrementFactor).toBeCloseTo(1, 14);
	});

	it('states the defaults, the method with the standard’s names, and the cautions', () => {
		const r = analyseDynamic({ layers: [brick] });
		expect(r.rsi).toBe(0.13); // ISO 6946:2017, Table 7, horizontal (from memory)
		expect(r.rse).toBe(0.04);
		expect(r.periodH).toBe(24);
		expect(r.notes).toHaveLength(3);
		expect(r.method.join(' ')).toMatch(/ISO 13786/);
		for (const symbol of ['δ = √(λ·T/(π·ρ·c))', 'ξ = d/δ', 'Y12 = −1/Z12', 'f = |Y12|/U', 'κ1', 'Y11'])
			expect(r.method.join(' ')).toContain(symbol);
		expect(r.cautions.some((c) => c.includes('professional judgement'))).toBe(true);
		expect(r.cautions.some((c) => c.includes('whole periods'))).toBe(true);
	});
});

describe('ISO 13786 input validation', () => {
	const paths = (raw: unknown) => {
		const p = parseDynamicInput(raw);
		return p.ok ? [] : p.issues.map((i) => i.path);
	};

	it('names each bad field, counted from one in the message', () => {
		const p = parseDynamicInput({
			layers: [
				{ ...brick, thicknessMm: -1 },
				{ ...plaster, specificHeat: 0.84 },
				{ resistance: 0.18, lambda: 2 },
				{}
			],
			periodH: 0,
			rsi: -0.1
		});
		expect(p.ok).toBe(false);
		if (p.ok) return;
		expect(p.issues.map((i) => i.path).sort()).toEqual(
			[
				'layers.0.thicknessMm',
				'layers.1.specificHeat',
				'layers.2.lambda',
				'layers.3',
				'periodH',
				'rsi'
			].sort()
		);
		const by = (path: string) => p.issues.find((i) => i.path === path)!.message;
		expect(by('layers.0.thicknessMm')).toBe(
			'Layer 1 (“solid brick”): thickness d must be greater than 0 mm, got -1'
		);
		expect(by('layers.1.specificHeat')).toMatch(/kJ\/\(kg·K\) must be multiplied by 1000/);
		expect(by('periodH')).toBe('Period T must be at least 1 h, got 0');
	});

	it('refuses missing fields of a material layer, non-numbers and empty build-ups', () => {
		expect(paths({ layers: [{ thicknessMm: 100, lambda: 1 }] })).toEqual([
			'layers.0.density',
			'layers.0.specificHeat'
		]);
		expect(paths({ layers: [{ ...brick, lambda: '0.77' }] })).toEqual(['layers.0.lambda']);
		expect(paths({ layers: [{ ...brick, density: Number.NaN }] })).toEqual(['layers.0.density']);
		expect(paths({ layers: [] })).toEqual(['layers']);
		expect(paths(null)).toEqual(['(input)']);
	});

	it('refuses a build-up thicker than the bound in penetration depths, and a zero resistance', () => {
		// 3 m of concrete at T = 1 h: δ = √(2·3600/(π·2.4·10⁶)) = 0.0309 m, ξ = 97; two of them exceed 100
		expect(DYNAMIC_XI_TOTAL_MAX).toBe(100);
		const p = parseDynamicInput({ layers: [concrete(3000), concrete(3000)], periodH: 1 });
		expect(p.ok ? '' : p.issues[0].message).toMatch(/^Layers are 194\.\d penetration depths thick/);
		expect(paths({ layers: [{ resistance: 0 }], rsi: 0, rse: 0 })).toEqual(['layers']);
		expect(() => analyseDynamic({ layers: [concrete(3000), concrete(3000)], periodH: 1 })).toThrow(
			CalculationInputError
		);
	});

	it('every accepted corner gives finite numbers; contrived alternations beyond the matrix bound are refused', () => {
		// the lightest, most conductive and least capacitive layers at the longest period, and the reverse
		const light = { thicknessMm: 10000, lambda: 1000, density: 0.1, specificHeat: 50 };
		const heavy = { thicknessMm: 0.001, lambda: 1e-5, density: 25000, specificHeat: 20000 };
		for (const input of [
			{ layers: Array(100).fill(light), periodH: 8760, rsi: 0, rse: 0 },
			{ layers: Array(100).fill(heavy), periodH: 1, rsi: 10, rse: 10 },
			{ layers: [light, heavy, { resistance: 100 }], periodH: 1 }
		]) {
			const r = analyseDynamic(input);
			expect(nonFinite(r)).toEqual([]);
			expect(r.decrementFactor).toBeGreaterThan(0);
		}
		// 50 pairs of λ 1000, ρ 25 000, c 20 000 (ξ = 1 each at 1 h) and R = 1.99: entries reach 10²⁴⁸
		const delta = Math.sqrt((1000 * 3600) / (Math.PI * 25000 * 20000));
		const metal = { thicknessMm: delta * 1000, lambda: 1000, density: 25000, specificHeat: 20000 };
		const layers = Array.from({ length: 100 }, (_, i) => (i % 2 ? { resistance: 1.99 } : metal));
		expect(paths({ layers, periodH: 1, rsi: 10, rse: 10 })).toEqual(['layers']);
	});
});
