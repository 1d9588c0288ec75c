// A dwelling's total floor area (stored, validated, copied) and the heat capacity of its elements read
// from their stored build-ups and results. The κ1 of a build-up comes from the ISO 13786 calculation
// checked against numpy in tests/dwellings/dynamic.test.ts; here the server must give the same figure
// from the stored row as the engine gives from the build-up directly. Material values are of the usual
// order (common practice, no source).
import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam } from '../../factories';
import { analyseElement } from '../../../src/lib/physics';
import { elementDynamics } from '../../../src/lib/dwellings/dynamic';
import { toElementInput, type StoredBuildUp } from '../../../src/lib/dwellings/element-input';

const WALL: StoredBuildUp = {
	layers: [
		{ name: 'Gypsum plaster', thicknessMm: 15, lambda: 0.57, mu: 10, density: 1300, specificHeat: 1000 },
		{ name: 'Solid brick', thicknessMm: 240, lambda: 0.77, mu: 10, density: 1800, specificHeat: 840 },
		{ name: 'EPS board', thicknessMm: 120, lambda: 0.035, mu: 60, density: 20, specificHeat: 1450 }
	]
};

describe.skipIf(!hasDatabase)('floor area and heat capacity on the server', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const { readDwellingHeatCapacity } = await import('../../../src/lib/server/dwellings/heat-capacity');
	const { ValidationError } = await import('../../../src/lib/server/errors');
	const { asMember, ref } = await import('../../factories-dwellings');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('stores the floor area, changes and clears it, copies it, and refuses one out of range by name', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), floorArea: 86.5 });
		expect(d.floorArea).toBe(86.5);
		const changed = await dwellings.updateDwelling(m, d.id, { floorArea: 90, version: d.version });
		expect(changed.floorArea).toBe(90);
		const copy = await dwellings.copyDwelling(m, d.id, { reference: ref() });
		expect((await dwellings.getDwelling(m.organisationId, copy.id))?.floorArea).toBe(90);
		const cleared = await dwellings.updateDwelling(m, d.id, { floorArea: null, version: changed.version });
		expect(cleared.floorArea).toBeNull();
		for (const floorArea of [0, -5, 200000, 'ninety']) {
			const err = await dwellings.createDwelling(m, { reference: ref(), floorArea }).catch((x) => x);
			expect(err, String(floorArea)).toBeInstanceOf(ValidationError);
			expect(err.issues.map((i: { path: string }) => i.path)).toEqual(['floorArea']);
		}
	});

	it('reads each element’s κ1 from its stored row as the engine gives it, and says what is not counted', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref(), floorArea: 60 });
		await elements.createElement(m, d.id, {
			name: 'Solid wall',
			kind: 'external-wall',
			area: 30,
			buildUp: WALL
		});
		await elements.createElement(m, d.id, {
			name: 'Window',
			kind: 'window',
			area: 6,
			givenU: 1.4,
			givenUSource: 'maker’s declaration (invented for tests)'
		});
		const noDensity = structuredClone(WALL);
		delete noDensity.layers[1].density;
		await elements.createElement(m, d.id, {
			name: 'Gable',
			kind: 'external-wall',
			area: 10,
			buildUp: noDensity
		});

		const found = await readDwellingHeatCapacity(m.organisationId, d.id, 60);
		const direct = elementDynamics(
			WALL,
			analyseElement(toElementInput({ heatFlow: 'horizontal', buildUp: WALL }))
		);
		expect(direct.ok).toBe(true);
		if (!direct.ok) return;
		expect(found.counted.map((c) => c.name)).toEqual(['Solid wall']);
		expect(found.counted[0].kappa1).toBeCloseTo(direct.value.kappa1, 9);
		expect(found.cm).toBeCloseTo(direct.value.kappa1 * 30, 6);
		expect(found.cmPerFloorArea).toBeCloseTo((direct.value.kappa1 * 30) / 60, 6);
		expect(found.glazed.map((g) => g.name)).toEqual(['Window']);
		expect(found.missing).toEqual([
			expect.objectContaining({
				name: 'Gable',
				reason: 'give the density and specific heat of layer 2 (layer details)'
			})
		]);
	});
});
