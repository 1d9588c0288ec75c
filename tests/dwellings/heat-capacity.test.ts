// The heat capacity of a dwelling's elements (src/lib/dwellings/heat-capacity.ts). The sums follow
// ISO 13790:2008, 12.3.1: the internal heat capacity Cm = Σ κj·Aj and the effective mass area
// Am = Cm² / Σ(Aj·κj²) (both recalled from memory); the figure per floor area is Cm / Af. The κ1 of each
// element comes from the ISO 13786 calculation, which tests/dwellings/dynamic.test.ts checks against an
// independent numpy implementation; here the expected sums are worked by hand beside each check. That
// windows and doors store no heat worth counting is common practice, no source.
import { describe, expect, it } from 'vitest';
import { analyseElement } from '../../src/lib/physics';
import { elementDynamics, type ElementDynamics } from '../../src/lib/dwellings/dynamic';
import { toElementInput, type StoredBuildUp } from '../../src/lib/dwellings/element-input';
import { dwellingHeatCapacity, type HeatCapacityElement } from '../../src/lib/dwellings/heat-capacity';
import type { DynamicResult } from '../../src/lib/physics/dynamic';

/** Dynamics with only the figures the sums read. */
const figures = (
	kappa1: number,
	decrementFactor: number,
	y12: number,
	timeLagH: number
): ElementDynamics => ({
	ok: true,
	value: { kappa1, decrementFactor, y12: { modulus: y12, timeLagH } } as unknown as DynamicResult
});
const el = (
	id: string,
	kind: HeatCapacityElement['kind'],
	area: number,
	dynamics: ElementDynamics | null
) => ({
	id,
	name: id,
	kind,
	area,
	dynamics
});

describe('dwellingHeatCapacity', () => {
	it('sums κ1·A, and gives the effective mass area and the figure per floor area', () => {
		const r = dwellingHeatCapacity(
			[
				el('wall', 'external-wall', 50, figures(60, 0.2, 0.06, 10)),
				el('roof', 'pitched-roof-ceiling', 40, figures(10, 0.9, 0.14, 3))
			],
			80
		);
		// Cm = 60·50 + 10·40 = 3400 kJ/K
		expect(r.cm).toBeCloseTo(3400, 9);
		// Am = 3400² / (50·60² + 40·10²) = 11 560 000 / 184 000 = 62.8261 m²
		expect(r.am).toBeCloseTo(11_560_000 / 184_000, 9);
		// Cm / Af = 3400 / 80 = 42.5 kJ/(m²·K)
		expect(r.cmPerFloorArea).toBeCloseTo(42.5, 9);
		// Σ|Y12|·A = 0.06·50 + 0.14·40 = 8.6 W/K
		expect(r.periodicTransmittanceArea).toBeCloseTo(8.6, 9);
		// area-weighted f = (0.2·50 + 0.9·40) / 90 = 0.51111; time lag (10·50 + 3·40) / 90 = 6.8889 h
		expect(r.meanDecrementFactor).toBeCloseTo(46 / 90, 9);
		expect(r.meanTimeLagH).toBeCloseTo(620 / 90, 9);
		expect(r.complete).toBe(true);
	});

	it('takes windows and doors as storing no heat, and lists what cannot be counted and why', () => {
		const r = dwellingHeatCapacity(
			[
				el('wall', 'external-wall', 50, figures(60, 0.2, 0.06, 10)),
				el('window', 'window', 12, null),
				el('floor', 'ground-floor', 45, { ok: false, reason: 'not given for a floor on the ground' }),
				el('given wall', 'external-wall', 5, null)
			],
			null
		);
		expect(r.cm).toBeCloseTo(3000, 9);
		expect(r.glazed.map((g) => g.id)).toEqual(['window']);
		expect(r.missing).toEqual([
			{ id: 'floor', name: 'floor', reason: 'not given for a floor on the ground' },
			{ id: 'given wall', name: 'given wall', reason: 'no build-up: its U-value is given' }
		]);
		expect(r.complete).toBe(false);
		// without a floor area there is no figure per floor area
		expect(r.cmPerFloorArea).toBeNull();
	});

	it('has no sums when nothing can be counted', () => {
		const r = dwellingHeatCapacity([el('window', 'window', 12, null)], 80);
		expect(r).toMatchObject({ cm: null, am: null, cmPerFloorArea: null, meanDecrementFactor: null });
	});

	it('takes each element’s κ1 from its build-up as the element page does', () => {
		const wall: StoredBuildUp = {
			layers: [
				{ name: 'Gypsum plaster', thicknessMm: 15, lambda: 0.57, mu: 10, density: 1300, specificHeat: 1000 },
				{ name: 'Solid brick', thicknessMm: 240, lambda: 0.77, mu: 10, density: 1800, specificHeat: 840 },
				{ name: 'EPS board', thicknessMm: 120, lambda: 0.035, mu: 60, density: 20, specificHeat: 1450 }
			]
		};
		const d = elementDynamics(
			wall,
			analyseElement(toElementInput({ heatFlow: 'horizontal', buildUp: wall }))
		);
		expect(d.ok).toBe(true);
		if (!d.ok) return;
		const r = dwellingHeatCapacity([el('wall', 'external-wall', 30, d)], 60);
		expect(r.counted[0].kappa1).toBe(d.value.kappa1);
		expect(r.cm).toBeCloseTo(d.value.kappa1 * 30, 9);
		// a single element: Am = (κ1·A)² / (A·κ1²) = A
		expect(r.am).toBeCloseTo(30, 9);
	});
});
