// What differs between an issued element and the current one (src/lib/dwellings/changes.ts): every
// input that changes a figure is named in the screen's words, and library links by their code, never
// their ids. Envelo's own rule (no source).
import { describe, expect, it } from 'vitest';
import { compareElements, type ComparedElement } from '../../src/lib/dwellings/changes';

const base = (over: Partial<ComparedElement['buildUp']> = {}, layerOver: object = {}): ComparedElement =>
	({
		id: 'e1',
		name: 'Garage wall',
		kind: 'external-wall',
		area: 12,
		heatFlow: 'horizontal',
		givenU: null,
		givenUSource: null,
		buildUp: {
			layers: [
				{
					name: 'Mineral wool between studs',
					thicknessMm: 140,
					lambda: 0.035,
					mu: 1,
					bridge: { lambda: 0.13, fraction: 0.1 },
					...layerOver
				}
			],
			...over
		},
		internal: null,
		climate: null,
		u: 0.28,
		materialRevisions: []
	}) as unknown as ComparedElement;

describe('compareElements', () => {
	it('names an unheated space, surface conditions and an inclination added after issue', () => {
		const changes = compareElements(
			base(),
			base({
				unheatedSpace: { externalElements: [{ areaM2: 6, uValue: 3 }], airChangeRate: 2, volumeM3: 60 },
				surfaceConditions: { windSpeed: 1 },
				inclinationDeg: 35
			})
		);
		expect(changes.map((c) => c.field)).toEqual([
			'Unheated space beside it',
			'Other surface conditions',
			'Inclination (°)'
		]);
	});

	it('names a bridging library material by its code, not as raw ids among other properties', () => {
		const changes = compareElements(
			base(),
			base(
				{},
				{
					bridgeMaterial: {
						materialId: '00000000-0000-4000-8000-000000000009',
						materialCode: 'G-TIM-SOFT-500'
					}
				}
			)
		);
		expect(changes).toEqual([
			expect.objectContaining({ field: 'Layer 1, bridging library material', after: 'G-TIM-SOFT-500' })
		]);
	});
});
