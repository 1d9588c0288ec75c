// Junctions built from elements, checked against facts outside the builder:
//   - ψ = L2D − Σ Uj·lj with 1-D U = 1/(Rsi + Σ d/λ + Rse) (ISO 10211; ISO 6946 surface resistances
//     Rsi 0.13 horizontal, 0.10 upward, 0.17 downward, Rse 0.04, from memory): a wall that runs
//     straight through has ψ = 0;
//   - the dimension systems (ISO 13789, as recalled) differ only in the flank lengths, so ψ in two
//     systems differs by Σ U·Δl exactly; an external corner of two walls has ψ < 0 on external
//     dimensions and > 0 on internal ones (common practice, no source);
//   - a corner of two identical walls is symmetric about its diagonal (geometry);
//   - raising a conductivity never lowers the heat flow between two temperatures (monotonicity of
//     steady conduction, the variational principle: any heat-conduction text), so a wider gap of
//     conductor in the insulation raises ψ;
//   - the inside surface of a plane wall has fRsi = 1 − Rsi/RT with Rsi = 0.25 (ISO 13788:2012, 3.1
//     and 5.4, as recalled), and a corner is colder than the plane wall (common practice, no source).
import { describe, expect, it } from 'vitest';
import { buildJunction, surfaceModel, type BuildRequest } from '../../src/lib/junctions/builder';
import { analyseJunction } from '../../src/lib/physics/junction';
import { analyseJunctionField } from '../../src/lib/physics/junction-field';
import { CAVITY_WALL, CEILING, FRAME_WALL, GROUND_FLOOR, PARTY_WALL, WINDOW } from './fixtures';

const base = (over: Partial<BuildRequest>): BuildRequest => ({
	type: 'external-corner',
	elements: { a: CAVITY_WALL },
	details: {},
	dimensionSystem: 'external',
	temperatures: { inside: 20, outside: 0 },
	...over
});

function built(over: Partial<BuildRequest>) {
	const r = buildJunction(base(over));
	if (!r.ok) throw new Error(JSON.stringify(r.issues));
	return r.built;
}

const psiOf = (over: Partial<BuildRequest>) => analyseJunction(built(over).model).psi!;

/** 1-D U of the cavity wall by hand: 1/(0.13 + 0.013/0.5 + 0.1/0.5 + 0.1/0.035 + 0.1/0.77 + 0.04). */
const U_CAVITY = 1 / (0.13 + 0.026 + 0.2 + 0.1 / 0.035 + 0.1 / 0.77 + 0.04);
const T_CAVITY = 313;

describe('junctions built from elements', () => {
	it('a wall running straight through has ψ = 0 in every dimension system', () => {
		const b = built({ type: 'straight' });
		expect(b.model.flanks![0].uValue).toBeCloseTo(U_CAVITY, 12);
		const r = analyseJunction(b.model);
		expect(Math.abs(r.psi!)).toBeLessThan(1e-3 * r.couplingCoefficient);
	});

	it('an external corner of two identical walls: ψe < 0 < ψi, and ψi − ψe = 2·U·t exactly', () => {
		const ext = built({ dimensionSystem: 'external' });
		const r = analyseJunction(ext.model);
		const flankSum = (s: 'internal' | 'external') =>
			ext.flanksBySystem[s].reduce((a, f) => a + (f.uValue * f.lengthMm) / 1000, 0);
		const psiE = r.couplingCoefficient - flankSum('external');
		const psiI = r.couplingCoefficient - flankSum('internal');
		expect(psiE).toBeCloseTo(r.psi!, 12);
		expect(psiE).toBeLessThan(0);
		expect(psiI).toBeGreaterThan(0);
		expect(psiI - psiE).toBeCloseTo((2 * U_CAVITY * T_CAVITY) / 1000, 10);
		// plausible size for a well insulated masonry corner (common practice, no source): |ψ| < 0.2
		expect(psiE).toBeGreaterThan(-0.2);
	});

	it('an internal corner is the mirror: ψ > 0 on external dimensions, < 0 on internal ones', () => {
		const ext = psiOf({ type: 'internal-corner', dimensionSystem: 'external' });
		const int = psiOf({ type: 'internal-corner', dimensionSystem: 'internal' });
		expect(ext).toBeGreaterThan(0);
		expect(int).toBeLessThan(0);
		expect(ext - int).toBeCloseTo((2 * U_CAVITY * T_CAVITY) / 1000, 10);
	});

	it('a corner of identical walls is symmetric about its diagonal: the coldest point lies on it', () => {
		const b = built({});
		const s = surfaceModel(b.model);
		const probes: [number, number][] = [
			[400, 150],
			[150, 400],
			[900, 60],
			[60, 900]
		];
		const r = analyseJunction({ ...s.model, probes });
		expect(r.coldest.x).toBeCloseTo(r.coldest.y, 6);
		expect(r.coldest.x).toBeCloseTo(T_CAVITY, 6);
		expect(r.probes![0]).toBeCloseTo(r.probes![1], 6);
		expect(r.probes![2]).toBeCloseTo(r.probes![3], 6);
	});

	it('two different walls: swapping them mirrors the model, with the same L2D', () => {
		const ab = analyseJunction(built({ elements: { a: CAVITY_WALL, b: FRAME_WALL } }).model);
		const ba = analyseJunction(built({ elements: { a: FRAME_WALL, b: CAVITY_WALL } }).model);
		expect(ba.couplingCoefficient).toBeCloseTo(ab.couplingCoefficient, 9);
		expect(ba.coldest.x).toBeCloseTo(ab.coldest.y, 6);
	});

	it('a gap in the insulation at the corner raises ψ, the more the wider', () => {
		const gap = (widthMm: number) => psiOf({ details: { gap: { widthMm, lambda: 0.5 } } });
		const none = psiOf({});
		const narrow = gap(20);
		const wide = gap(60);
		expect(narrow).toBeGreaterThan(none);
		expect(wide).toBeGreaterThan(narrow);
	});

	it('a conductive lintel at a window head raises ψ above the plain reveal', () => {
		const plain = psiOf({ type: 'window-head', elements: { a: CAVITY_WALL, b: WINDOW } });
		const lintel = psiOf({
			type: 'window-head',
			elements: { a: CAVITY_WALL, b: WINDOW },
			details: {
				insert: {
					name: 'Steel lintel',
					lambda: 50,
					alongFromMm: 0,
					lengthMm: 150,
					depthFromMm: 13,
					depthToMm: 220
				}
			}
		});
		expect(lintel).toBeGreaterThan(plain + 0.05);
	});

	it('the window panel reproduces the window’s U in one dimension', () => {
		const b = built({ type: 'window-jamb', elements: { a: CAVITY_WALL, b: WINDOW } });
		const panel = b.model.regions.find((r) => r.name === 'Window (panel)')!;
		const d = (panel.x1 - panel.x0) / 1000;
		expect(1 / (0.13 + d / panel.lambda + 0.04)).toBeCloseTo(1.4, 10);
		expect(b.glazing).toEqual(['inside (window)']);
		// the panel's own face is not an opaque surface of the fRsi check
		expect(surfaceModel(b.model, b.glazing).checked).not.toContain('inside (window)');
	});

	it('an intermediate floor: ψ on internal dimensions exceeds the overall-internal one by U·slab thickness', () => {
		const b = built({
			type: 'intermediate-floor',
			details: { floorSlab: { thicknessMm: 200, lambda: 2.3 } }
		});
		const r = analyseJunction(b.model);
		const sum = (s: 'internal' | 'overall-internal') =>
			b.flanksBySystem[s].reduce((a, f) => a + (f.uValue * f.lengthMm) / 1000, 0);
		expect(sum('internal') - sum('overall-internal')).toBeCloseTo(-(U_CAVITY * 200) / 1000, 10);
		expect(r.couplingCoefficient - sum('internal')).toBeGreaterThan(0);
	});

	it('builds every type from its elements into a model the engine accepts, with finite ψ', () => {
		const cases: Partial<BuildRequest>[] = [
			{ type: 'ground-floor', elements: { a: CAVITY_WALL, b: GROUND_FLOOR } },
			{ type: 'eaves', elements: { a: CAVITY_WALL, b: CEILING } },
			{
				type: 'flat-roof',
				elements: { a: CAVITY_WALL, b: { ...CEILING, kind: 'flat-roof', roofSpace: undefined } }
			},
			{ type: 'window-sill', elements: { a: CAVITY_WALL } },
			{ type: 'party-wall', elements: { a: CAVITY_WALL, b: PARTY_WALL } }
		];
		for (const c of cases) {
			const r = analyseJunction(built(c).model);
			expect(Number.isFinite(r.psi), c.type).toBe(true);
			expect(r.convergence.met, c.type).toBe(true);
		}
	});

	it('the ground floor extends the ground 20 m and takes the floor flank by ISO 13370 for B′ = 8 m', () => {
		const b = built({ type: 'ground-floor', elements: { a: CAVITY_WALL, b: GROUND_FLOOR } });
		const xs = b.model.regions.flatMap((r) => [r.x0, r.x1]);
		const ys = b.model.regions.flatMap((r) => [r.y0, r.y1]);
		expect(Math.min(...xs)).toBe(-20000);
		expect(Math.min(...ys)).toBe(-20000);
		// ISO 13370:2017 8.1 (from memory): dt = w + λ(Rsi + Rf + Rse); a well insulated floor (dt ≥ B′)
		// has U = λ/(0.457·B′ + dt)
		const rf = 0.065 / 1.15 + 0.1 / 0.022 + 0.15 / 1.35;
		const dt = 0.313 + 2 * (0.17 + rf + 0.04);
		expect(dt).toBeGreaterThan(8);
		const u = 2 / (0.457 * 8 + dt);
		expect(b.flanksBySystem.internal[1]).toMatchObject({ lengthMm: 4000 });
		expect(b.flanksBySystem.internal[1].uValue).toBeCloseTo(u, 12);
		expect(b.flanksBySystem.external[1].lengthMm).toBe(4313);
	});

	it('fRsi of a plane wall is 1 − 0.25/RT; a corner is colder than the plane wall', () => {
		const straight = surfaceModel(built({ type: 'straight' }).model);
		const plane = analyseJunctionField(straight.model, { surfaceEnvironments: straight.checked });
		const rt = 0.25 + 0.026 + 0.2 + 0.1 / 0.035 + 0.1 / 0.77 + 0.04;
		expect(plane.fRsi!).toBeCloseTo(1 - 0.25 / rt, 4);
		const corner = surfaceModel(built({}).model);
		const c = analyseJunctionField(corner.model, { surfaceEnvironments: corner.checked });
		expect(c.fRsi!).toBeLessThan(plane.fRsi! - 0.02);
	});
});

describe('what the builder refuses, by field', () => {
	const issues = (over: Partial<BuildRequest>) => {
		const r = buildJunction(base(over));
		return r.ok ? [] : r.issues;
	};
	it('names the missing or wrong element', () => {
		expect(issues({ elements: {} })).toContainEqual({
			path: 'details.elements.a',
			message: expect.stringMatching(/required/)
		});
		expect(issues({ elements: { a: GROUND_FLOOR } })).toContainEqual({
			path: 'details.elements.a',
			message: expect.stringMatching(/must be an external wall/)
		});
		expect(issues({ type: 'ground-floor', elements: { a: CAVITY_WALL } })).toContainEqual({
			path: 'details.elements.b',
			message: expect.stringMatching(/required/)
		});
		expect(
			issues({
				type: 'eaves',
				elements: { a: CAVITY_WALL, b: { ...CEILING, kind: 'pitched-roof-rafters' } }
			})[0].message
		).toMatch(/slopes, model it free-form/);
	});
	it('names an insert outside the wall and a window panel that does not fit', () => {
		expect(
			issues({
				details: {
					insert: { name: 'X', lambda: 1, alongFromMm: 9000, lengthMm: 100, depthFromMm: 0, depthToMm: 50 }
				}
			})
		).toContainEqual({
			path: 'details.insert.alongFromMm',
			message: expect.stringMatching(/beyond the wall/)
		});
		expect(
			issues({ type: 'window-head', details: { window: { thicknessMm: 70, positionMm: 300 } } })
		).toContainEqual({
			path: 'details.window.positionMm',
			message: expect.stringMatching(/outside the wall/)
		});
	});
	it('names a layer that cannot be modelled', () => {
		const wall = {
			...CAVITY_WALL,
			layers: [...CAVITY_WALL.layers, { name: 'Void', thicknessMm: 400, air: 'unventilated' as const }]
		};
		expect(issues({ elements: { a: wall } })).toContainEqual({
			path: 'details.elements.a.layers.4',
			message: expect.stringMatching(/over 300 mm/)
		});
	});
});
