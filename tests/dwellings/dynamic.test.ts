// The heat storage of an element as entered (src/lib/dwellings/dynamic.ts): its stored build-up
// handed to the ISO 13786 calculation with the element's own surface and layer resistances. The
// figures are checked against the independent Python/numpy implementation of ISO 13786 in
// tests/physics/reference/iso13786.py (numpy's complex cosh/sinh of k·d, not the standard's expanded
// form; the standard's formulas are recalled from memory); what is left out and why is this product's
// rule (no source). Build-ups are constructed; material values of the usual order (common practice,
// no source).
import { describe, expect, it } from 'vitest';
import { analyseElement } from '../../src/lib/physics';
import { elementDynamics } from '../../src/lib/dwellings/dynamic';
import { toElementInput, type StoredBuildUp } from '../../src/lib/dwellings/element-input';
import { numpyVersion, referenceTitle, runReference } from '../physics/reference/python';

const solidWall = (): StoredBuildUp => ({
	layers: [
		{ name: 'Gypsum plaster', thicknessMm: 15, lambda: 0.57, mu: 10, density: 1300, specificHeat: 1000 },
		{ name: 'Solid brick', thicknessMm: 240, lambda: 0.77, mu: 10, density: 1800, specificHeat: 840 },
		{ name: 'EPS board', thicknessMm: 120, lambda: 0.035, mu: 60, density: 20, specificHeat: 1450 },
		{ name: 'Render', thicknessMm: 10, lambda: 1.0, mu: 15, density: 1800, specificHeat: 1000 }
	]
});

const analyse = (b: StoredBuildUp) =>
	analyseElement(toElementInput({ heatFlow: 'horizontal', buildUp: b, internal: null }));

describe('elementDynamics', () => {
	it("uses the element's Rsi and Rse, and gives the same steady-state U", () => {
		const b = solidWall();
		const r = analyse(b);
		const d = elementDynamics(b, r);
		expect(d.ok).toBe(true);
		if (!d.ok) return;
		expect(d.value.rsi).toBe(r.rsi);
		expect(d.value.rse).toBe(r.rse);
		expect(d.value.u).toBeCloseTo(1 / r.rTotal, 12);
		expect(d.value.periodH).toBe(24);
	});

	it('takes an air layer as its resistance from the U-value calculation, without heat capacity', () => {
		const b = solidWall();
		b.layers.splice(2, 0, { name: 'Cavity', thicknessMm: 50, air: 'unventilated', mu: 1 });
		const r = analyse(b);
		const d = elementDynamics(b, r);
		expect(d.ok && d.value.layers[2]).toMatchObject({
			kind: 'resistance',
			r: r.layers[2].r,
			heatCapacity: 0
		});
	});

	it('says what is missing: density or specific heat, a bridged layer, a floor on the ground', () => {
		const b = solidWall();
		delete b.layers[1].density;
		delete b.layers[3].specificHeat;
		expect(elementDynamics(b, analyse(b))).toEqual({
			ok: false,
			reason: 'give the density and specific heat of layers 2, 4 (layer details)'
		});
		const framed = solidWall();
		framed.layers[2].bridge = { lambda: 0.13, fraction: 0.1 };
		expect(elementDynamics(framed, analyse(framed))).toMatchObject({
			ok: false,
			reason: /layer 3 is bridged/
		});
		const floor: StoredBuildUp = { ...solidWall(), ground: { perimeterM: 30, areaM2: 50 } };
		const fr = analyseElement(toElementInput({ heatFlow: 'downward', buildUp: floor, internal: null }));
		expect(elementDynamics(floor, fr)).toEqual({ ok: false, reason: 'not given for a floor on the ground' });
	});

	it('leaves out the layers outside a well-ventilated air layer, as the U-value does', () => {
		const b = solidWall();
		b.layers.push(
			{ name: 'Ventilated gap', thicknessMm: 25, air: 'well-ventilated' },
			{ name: 'Cladding', thicknessMm: 20, lambda: 0.13, mu: 50 } // no ρ, c: not needed
		);
		const d = elementDynamics(b, analyse(b));
		expect(d.ok && d.value.layers.map((l) => l.name)).toEqual([
			'Gypsum plaster',
			'Solid brick',
			'EPS board',
			'Render'
		]);
	});
});

describe.skipIf(!numpyVersion)(`the element's figures against ISO 13786 in numpy (${referenceTitle})`, () => {
	it('κ1, κ2, Y12 and the decrement factor agree to 1e-9 relative', () => {
		const b = solidWall();
		const r = analyse(b);
		const d = elementDynamics(b, r);
		if (!d.ok) throw new Error(d.reason);
		const input = {
			layers: b.layers.map(({ name, thicknessMm, lambda, density, specificHeat }) => ({
				name,
				thicknessMm,
				lambda,
				density,
				specificHeat
			})),
			rsi: r.rsi,
			rse: r.rse,
			periodH: 24
		};
		type Ref = { kappa1: number; kappa2: number; u: number; y12: [number, number] };
		const [p] = runReference<{ results: Ref[] }>('iso13786.py', { cases: [input] }).results;
		const rel = (a: number, e: number) => Math.abs(a - e) / Math.abs(e);
		expect(rel(d.value.kappa1, p.kappa1)).toBeLessThan(1e-9);
		expect(rel(d.value.kappa2, p.kappa2)).toBeLessThan(1e-9);
		const y12 = Math.hypot(p.y12[0], p.y12[1]);
		expect(rel(d.value.y12.modulus, y12)).toBeLessThan(1e-9);
		expect(rel(d.value.decrementFactor, y12 / p.u)).toBeLessThan(1e-9);
	});
});
