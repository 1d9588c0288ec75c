// From stored choices to the calculation, as the worker and the server take it: ψ in every dimension
// system from one L2D (ISO 10211; ISO 13789 dimension systems, as recalled), the fRsi run with
// Rsi 0.25 (ISO 13788, as recalled) judged against the climate, and refusals by field.
import { describe, expect, it } from 'vitest';
import { runJunction, designTemperatures, type ElementLike } from '../../src/lib/junctions/run';
import { junctionFieldsSchema } from '../../src/lib/junctions/schema';
import { CAVITY_WALL } from './fixtures';

const WALL: ElementLike = {
	id: '00000000-0000-4000-8000-000000000001',
	name: 'Cavity wall',
	kind: 'external-wall',
	heatFlow: 'horizontal',
	buildUp: { layers: CAVITY_WALL.layers },
	givenU: null,
	version: 3
};
// invented for this test, not a real place
const MONTHS = [-1, 0, 3, 6, 10, 13, 15, 15, 12, 8, 4, 1].map((temperature, i) => ({
	month: i + 1,
	temperature,
	relativeHumidity: 85
}));

describe('running a junction', () => {
	it('builds from the dwelling’s elements: ψ in every system, fRsi against the critical month', () => {
		const r = runJunction({
			type: 'external-corner',
			dimensionSystem: 'external',
			details: { mode: 'builder', elements: { a: WALL.id } },
			elements: [WALL],
			months: MONTHS
		});
		if (!r.ok) throw new Error(JSON.stringify(r.issues));
		const c = r.result;
		expect(c.psi).toBe(c.psiBySystem.external);
		expect(c.psiBySystem.internal! - c.psiBySystem.external!).toBeGreaterThan(0);
		expect(c.psiBySystem['overall-internal']).toBeCloseTo(c.psiBySystem.internal!, 12); // the same for a corner
		expect(c.surface.rsi).toBe(0.25);
		const highest = Math.max(...c.surface.months.map((m) => m.fRsiMin ?? -Infinity));
		expect(c.surface.critical!.fRsiMin).toBe(highest);
		expect(c.surface.critical!.pass).toBe(c.surface.fRsi >= highest);
		expect(c.surface.temperatures).toEqual({ inside: 20, outside: -1 });
		expect(c.surface.coldest.temperature).toBeCloseTo(-1 + 21 * c.surface.fRsi, 10);
		expect(c.elements).toEqual([{ id: WALL.id, name: 'Cavity wall', version: 3 }]);
		expect(c.cautions.join(' ')).toMatch(/do not replace, professional judgement/);
		expect(c.method.join(' ')).toMatch(/external dimensions/);
	});

	it('refuses an element of another dwelling and a free-form model, by field', () => {
		const a = runJunction({
			type: 'external-corner',
			dimensionSystem: 'external',
			details: { mode: 'builder', elements: { a: '00000000-0000-4000-8000-000000000009' } },
			elements: [WALL],
			months: null
		});
		expect(a).toEqual({
			ok: false,
			issues: [{ path: 'details.elements.a', message: 'is not an element of this dwelling' }]
		});
		const b = runJunction({
			type: 'other',
			dimensionSystem: 'internal',
			details: { mode: 'free-form', elements: {} },
			model: {
				regions: [{ x0: 0, x1: 100, y0: 0, y1: 100, lambda: -1 }],
				boundaries: [{ from: [0, 0], to: [0, 100], environment: 'in' }],
				environments: { in: { temperature: 20, rs: 0.13 } }
			},
			elements: [],
			months: null
		});
		expect(b.ok).toBe(false);
		if (!b.ok) expect(b.issues.map((i) => i.path)).toContain('model.regions.0.lambda');
	});

	it('takes design temperatures from the climate’s coldest month, else −5 °C', () => {
		expect(designTemperatures({ temperature: 21 }, MONTHS)).toEqual({ inside: 21, outside: -1 });
		expect(designTemperatures({ temperature: 21 }, null)).toEqual({ inside: 21, outside: -5 });
	});
});

describe('the fields of a junction', () => {
	it('need a named source for an entered ψ, and details or a model for a calculated one', () => {
		const base = { name: 'Corner', type: 'external-corner', lengthM: 10, dimensionSystem: 'external' };
		const issues = (v: unknown) => {
			const r = junctionFieldsSchema.safeParse(v);
			return r.success ? [] : r.error.issues.map((i) => i.path.join('.'));
		};
		expect(issues({ ...base, source: 'entered', psiEntered: 0.05 })).toEqual(['psiSource']);
		expect(
			issues({ ...base, source: 'entered', psiEntered: 0.05, psiSource: 'Manufacturer’s calculation report' })
		).toEqual([]);
		expect(issues({ ...base, source: 'calculated' })).toEqual(['details']);
		expect(issues({ ...base, source: 'calculated', details: { mode: 'free-form' } })).toEqual(['model']);
		expect(issues({ ...base, source: 'calculated', details: { mode: 'builder' } })).toEqual([
			'details.elements.a'
		]);
		expect(issues({ ...base, lengthM: 0, source: 'entered', psiEntered: 0.05, psiSource: 'x' })).toEqual([
			'lengthM'
		]);
	});
});
