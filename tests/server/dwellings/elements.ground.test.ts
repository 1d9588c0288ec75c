import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam } from '../../factories';
import { toElementInput, type StoredBuildUp } from '../../../src/lib/dwellings/element-input';
import { blankRow, buildUpFromRows, groundText, rowFromLayer } from '../../../src/lib/dwellings/editor';
import { validateElement } from '../../../src/lib/dwellings/schema';

// Ground floors (ISO 13370:2017 8.1, formulas from memory), roof spaces (ISO 6946:2017 roof-space
// table, from memory) and per-layer corrections as the editor stores them and the server recomputes
// them. Expected values are hand calculations shown beside them.

// 150 mm concrete λ 1.5 (R 0.1): Rsi 0.17 + 0.1 + Rse 0.04 = 0.31 m²·K/W.
const SLAB = { name: 'Concrete slab', thicknessMm: 150, lambda: 1.5, mu: 100 };
// A 100 m², P 40 m: B′ = 5 m; dt = 0.3 + 2.0·0.31 = 0.92 m < B′
// U = 2·2/(π·5 + 0.92)·ln(π·5/0.92 + 1) = 0.696289 W/(m²·K)
const SLAB_U = 0.6962891;

describe('editor helpers and the engine input (pure)', () => {
	it('fasteners entered by diameter are stored as a cross-section and come back as the diameter', () => {
		const row = blankRow({
			name: 'Insulation',
			thickness: '100',
			lambda: '0.035',
			mu: '1',
			airGapLevel: '1',
			fasteners: true,
			fastenerLambda: '50',
			fastenerDiameter: '4',
			fastenerPerM2: '6'
		});
		const b = buildUpFromRows([row]);
		const l = b.layers[0];
		expect(l.airGapLevel).toBe(1);
		// 4 mm diameter: π·4²/4 = 12.566 mm²
		expect(l.fasteners?.areaMm2).toBeCloseTo(Math.PI * 4, 9);
		expect(l.fasteners?.perM2).toBe(6);
		expect(l.fasteners?.penetrationMm).toBeUndefined();
		expect(l.fastenerDiameterMm).toBe(4);
		const back = rowFromLayer(l);
		expect(back.fastenerDiameter).toBe('4');
		expect(back.airGapLevel).toBe('1');
		// the engine input drops the editor's diameter and keeps what the engine takes
		const input = toElementInput({ heatFlow: 'horizontal', buildUp: b, internal: null });
		expect(input.layers[0]).not.toHaveProperty('fastenerDiameterMm');
		expect(input.layers[0].fasteners?.lambda).toBe(50);
	});

	it('a ground floor without its own floor area takes the element’s, and stores it', () => {
		const raw = {
			name: 'Ground floor',
			kind: 'ground-floor',
			area: 100,
			heatFlow: 'downward',
			buildUp: { layers: [SLAB], ground: { perimeterM: 40 } }
		};
		const v = validateElement(raw, null);
		expect(v.ok).toBe(true);
		if (!v.ok) return;
		expect((v.data.buildUp as StoredBuildUp).ground?.areaM2).toBe(100);
		const input = toElementInput({ heatFlow: 'downward', buildUp: v.data.buildUp as StoredBuildUp });
		expect(input.ground).toEqual({ perimeterM: 40, areaM2: 100 });
	});

	it('a ground floor without a perimeter is refused, naming the field', () => {
		const v = validateElement(
			{
				name: 'Ground floor',
				kind: 'ground-floor',
				area: 100,
				heatFlow: 'downward',
				buildUp: buildUpFromRows(
					[blankRow({ name: 'Slab', thickness: '150', lambda: '1.5', mu: '100' })],
					undefined,
					undefined,
					{ ground: { perimeter: '', area: '', lambda: '', wall: '' } }
				)
			},
			null
		);
		expect(v.ok ? [] : v.issues.map((i) => i.path)).toEqual(['buildUp.ground.perimeterM']);
	});

	it('takes the wall thickness in mm, as every other thickness, and stores it in m', () => {
		const rows = [blankRow({ name: 'Slab', thickness: '150', lambda: '1.5', mu: '100' })];
		const b = buildUpFromRows(rows, undefined, undefined, {
			ground: { perimeter: '40', area: '100', lambda: '', wall: '300' }
		});
		expect(b.ground?.wallThicknessM).toBeCloseTo(0.3, 12);
		expect(groundText(b.ground).wall).toBe('300');
		expect(groundText({ perimeterM: 40, wallThicknessM: 0.365 }).wall).toBe('365');
		// text that is no number goes on to the engine, which names it
		const typo = buildUpFromRows(rows, undefined, undefined, {
			ground: { perimeter: '40', area: '', lambda: '', wall: '30o' }
		});
		expect(typo.ground?.wallThicknessM).toBe('30o');
	});

	it('engine errors on the ground and roof space come back under buildUp', () => {
		const v = validateElement(
			{
				name: 'Floor',
				kind: 'ground-floor',
				area: 100,
				heatFlow: 'downward',
				buildUp: { layers: [SLAB], ground: { perimeterM: 40, groundLambda: -1 } }
			},
			null
		);
		expect(v.ok ? [] : v.issues.map((i) => i.path)).toEqual(['buildUp.ground.groundLambda']);
		const r = validateElement(
			{
				name: 'Ceiling',
				kind: 'pitched-roof-ceiling',
				area: 40,
				heatFlow: 'horizontal',
				buildUp: { layers: [SLAB], roofSpace: 'boards-and-felt' }
			},
			null
		);
		expect(r.ok ? [] : r.issues.map((i) => i.path)).toEqual(['buildUp.roofSpace']);
	});

	it('old build-ups without the new fields still make the same input', () => {
		const input = toElementInput({ heatFlow: 'downward', buildUp: { layers: [SLAB] }, area: 100 });
		expect(input.ground).toBeUndefined();
		expect(input.roofSpace).toBeUndefined();
	});
});

describe.skipIf(!hasDatabase)('ground floors and roof spaces on the server', async () => {
	const dwellings = await import('../../../src/lib/server/dwellings');
	const elements = await import('../../../src/lib/server/dwellings/elements');
	const { ValidationError } = await import('../../../src/lib/server/errors');
	const { asMember, ref } = await import('../../factories-dwellings');

	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('stores the ground data and recomputes the floor by ISO 13370', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		const e = await elements.createElement(m, d.id, {
			name: 'Ground floor',
			kind: 'ground-floor',
			area: 100,
			buildUp: { layers: [SLAB], ground: { perimeterM: 40 } }
		});
		expect(e.heatFlow).toBe('downward');
		expect(e.buildUp?.ground).toEqual({ perimeterM: 40, areaM2: 100 });
		expect(e.lastResult!.uValue).toBeCloseTo(SLAB_U, 6);
		expect(e.lastResult!.uBuildUp).toBeCloseTo(1 / 0.31, 9);
		// what reports and audits compute from the stored row alone
		const again = toElementInput({ heatFlow: e.heatFlow, buildUp: e.buildUp, internal: e.internal });
		expect(again.ground).toEqual({ perimeterM: 40, areaM2: 100 });

		const err = await elements
			.createElement(m, d.id, {
				name: 'Ground floor',
				kind: 'ground-floor',
				area: 100,
				buildUp: { layers: [SLAB], ground: { perimeterM: 0 } }
			})
			.catch((x) => x);
		expect(err).toBeInstanceOf(ValidationError);
		// an exposed perimeter must be more than zero
		expect(err.issues.map((i: { path: string }) => i.path)).toEqual(['buildUp.ground.perimeterM']);
	});

	it('adds the roof-space resistance for a ceiling under a loft', async () => {
		const t = await makeTeam();
		const m = asMember(t.assessor);
		const d = await dwellings.createDwelling(m, { reference: ref() });
		// RT = 0.10 + 12.5/250 + 200/40 + 0.04 = 5.19; with felt under the tiles + 0.2 = 5.39
		const e = await elements.createElement(m, d.id, {
			name: 'Loft',
			kind: 'pitched-roof-ceiling',
			area: 40,
			buildUp: {
				layers: [
					{ name: 'Plasterboard', thicknessMm: 12.5, lambda: 0.25 },
					{ name: 'Mineral wool', thicknessMm: 200, lambda: 0.04 }
				],
				roofSpace: 'tiles-with-felt-or-boards'
			}
		});
		expect(e.heatFlow).toBe('upward');
		expect(e.buildUp?.roofSpace).toBe('tiles-with-felt-or-boards');
		expect(e.lastResult!.rTotal).toBeCloseTo(5.39, 9);
	});
});
