// The audit recomputes a basement floor, a slab with edge insulation and a wall beside an unheated
// space from their stored build-ups, through the same toElementInput and analyseElement the report
// used: the recompute and the reproduction of the issued record give the U that was issued, and no
// flag says otherwise. The build-ups are stored the way the element form stores them (validateElement,
// which also fills the floor area and Ai from the element's area). Expected U-values are the hand
// calculations of tests/physics/element-basement.test.ts and element-unheated-space.test.ts
// (ISO 13370:2017, 8.3, 8.4 and edge insulation; ISO 6946:2017, 6.10.3; formulas from memory).
// The elements are invented.
import { describe, expect, it } from 'vitest';
import { auditDwelling } from '../../src/lib/audit/assess';
import { validateElement } from '../../src/lib/dwellings/schema';
import type { StoredBuildUp } from '../../src/lib/dwellings/element-input';
import type { AuditElement } from '../../src/lib/audit/types';
import { bundleOf, element } from './bundles';

/** The build-up as the element form stores it. */
function stored(kind: AuditElement['kind'], area: number, buildUp: StoredBuildUp): StoredBuildUp {
	const v = validateElement(
		{ name: 'x', kind, area, buildUp, internal: { temperature: 20, humidityClass: 3 } },
		null
	);
	if (!v.ok) throw new Error(JSON.stringify(v.issues));
	return v.data.buildUp as StoredBuildUp;
}

const layer = (r: number) => ({ name: 'Insulation', thicknessMm: r * 40, lambda: 0.04, mu: 50 });

const basement = element('basement', [], {
	name: 'Floor over the cellar',
	kind: 'ground-floor',
	area: 100,
	heatFlow: 'downward',
	buildUp: stored('ground-floor', 100, {
		layers: [layer(1.66)],
		ground: {
			perimeterM: 40,
			basement: {
				kind: 'unheated',
				depthM: 2.5,
				wallR: 0.2,
				floorR: 0,
				wallAboveGroundHeightM: 0.5,
				wallAboveGroundU: 1.5,
				airChangeRate: 0.3,
				volumeM3: 250
			}
		}
	})
});
const heated = element('heated', [], {
	name: 'Heated basement',
	kind: 'ground-floor',
	area: 200,
	heatFlow: 'downward',
	buildUp: stored('ground-floor', 200, {
		layers: [layer(0.5)],
		ground: { perimeterM: 40, areaM2: 100, basement: { kind: 'heated', depthM: 2.5, wallR: 1.5 } }
	})
});
const slab = element('slab', [], {
	name: 'Slab with edge insulation',
	kind: 'ground-floor',
	area: 100,
	heatFlow: 'downward',
	buildUp: stored('ground-floor', 100, {
		layers: [layer(0.1)],
		ground: {
			perimeterM: 40,
			edge: { orientation: 'horizontal', widthM: 1, insulationThicknessM: 0.05, insulationLambda: 0.025 }
		}
	})
});
const wall = element('garage-wall', [], {
	name: 'Wall to the garage',
	area: 20,
	buildUp: stored('external-wall', 20, {
		layers: [{ name: 'Insulated wall', thicknessMm: 73.2, lambda: 0.04, mu: 10 }],
		unheatedSpace: {
			externalElements: [
				{ name: 'garage walls', areaM2: 40, uValue: 1.5 },
				{ name: 'garage roof', areaM2: 20, uValue: 2.0 },
				{ name: 'garage door', areaM2: 6, uValue: 3.0 }
			],
			airtightness: 'some-open-joints',
			volumeM3: 60
		}
	})
});

describe('the audit recomputes the new ground-floor types and unheated spaces', () => {
	it('stores the areas the later recomputes need', () => {
		expect(basement.buildUp!.ground!.areaM2).toBe(100);
		expect(wall.buildUp!.unheatedSpace!.internalAreaM2).toBe(20);
	});

	it('gives the issued U from the stored build-ups, with no flag of a failed or differing recompute', () => {
		const audit = auditDwelling(bundleOf([basement, heated, slab, wall], { limitTable: null }));
		const expected: Record<string, number> = {
			basement: 0.394965, // ISO 13370:2017, 8.4 (hand calculation in tests/physics/element-basement.test.ts)
			heated: 0.368177, // ISO 13370:2017, 8.3 (same file)
			slab: 0.556501, // ISO 13370:2017, edge insulation (same file)
			'garage-wall': 1 / (2 + 20 / 177.4) // ISO 6946:2017, 6.10.3 (tests/physics/element-unheated-space.test.ts)
		};
		for (const e of audit.elements) {
			expect(e.issued, e.name).not.toBeNull();
			expect(e.issued!.u, e.name).toBeCloseTo(expected[e.elementId], 5);
			expect(e.used!.u, e.name).toBe(e.issued!.u);
			expect(e.reproduced!.u, e.name).toBe(e.issued!.u);
			expect(e.error, e.name).toBeUndefined();
		}
		const codes = audit.flags.map((f) => f.code);
		expect(codes).not.toContain('recompute-failed');
		expect(codes).not.toContain('not-reproducing');
	});
});
