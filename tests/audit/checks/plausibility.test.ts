// The plausibility checks. The ranges and their sources are in src/lib/audit/plausible.ts: λ of masonry
// 0.08–3.5 W/(m·K) (ISO 10456:2007, Table 3, from memory), of insulation 0.015–0.065 W/(m·K), given U
// 0.4–6 W/(m²·K), one insulation layer at most 600 mm, an external wall 60–1000 mm and a party wall
// 60–600 mm in total (common practice, no source). A supplied thickness range is the revision's own.
import { describe, it, expect } from 'vitest';
import {
	givenUImplausible,
	insulationLayerTooThick,
	lambdaImplausible,
	thicknessOutsideSupplied,
	totalThicknessImplausible
} from '../../../src/lib/audit/checks/plausibility';
import { contextOf, element, glazed, layerOf, library, linked, rev } from '../bundles';

describe('givenUImplausible', () => {
	it('flags a given U outside 0.4–6 W/(m²·K)', () => {
		expect(givenUImplausible(contextOf(glazed('w1', 7.5)))).toEqual([
			{
				code: 'thickness-implausible',
				severity: 'low',
				elementId: 'w1',
				reason:
					'Window (Window): a given U of 7.5 W/(m²·K) is outside the usual 0.4–6 for windows and doors (common practice, no source).'
			}
		]);
		expect(givenUImplausible(contextOf(glazed('w1', 0.2)))).toHaveLength(1);
	});
	it('raises nothing inside the range, at its ends, or without a given U', () => {
		for (const u of [0.4, 1.4, 6]) expect(givenUImplausible(contextOf(glazed('w1', u)))).toEqual([]);
		expect(givenUImplausible(contextOf(glazed('w1', null)))).toEqual([]);
	});
});

describe('thicknessOutsideSupplied', () => {
	it('flags a layer thinner or thicker than its revision is supplied', () => {
		const block = rev('block', {
			name: 'Aerated block',
			lambda: 0.15,
			thicknessMinMm: 75,
			thicknessMaxMm: 215
		});
		expect(thicknessOutsideSupplied(layerOf(linked(block, 50), { rev: block, index: 1 }))).toEqual([
			{
				code: 'thickness-implausible',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 1,
				reason: 'Front wall (External wall), layer 2 "Aerated block" is 50 mm; BLOCK is supplied from 75 mm.'
			}
		]);
		expect(thicknessOutsideSupplied(layerOf(linked(block, 250), { rev: block }))[0].reason).toBe(
			'Front wall (External wall), layer 1 "Aerated block" is 250 mm; BLOCK is supplied up to 215 mm.'
		);
	});
	it('raises nothing within the supplied range, without one, or without a revision', () => {
		const block = rev('block', {
			name: 'Aerated block',
			lambda: 0.15,
			thicknessMinMm: 75,
			thicknessMaxMm: 215
		});
		expect(thicknessOutsideSupplied(layerOf(linked(block, 100), { rev: block }))).toEqual([]);
		const { brick } = library();
		expect(thicknessOutsideSupplied(layerOf(linked(brick, 2000), { rev: brick }))).toEqual([]);
		expect(thicknessOutsideSupplied(layerOf({ name: 'Block', thicknessMm: 5, lambda: 0.15 }))).toEqual([]);
	});
});

describe('lambdaImplausible', () => {
	it("flags λ outside its revision's category range", () => {
		const brick = rev('brick', { name: 'Clay brick', lambda: 5 });
		expect(lambdaImplausible(layerOf(linked(brick, 102), { rev: brick }))).toEqual([
			{
				code: 'lambda-implausible',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 0,
				reason:
					'Front wall (External wall), layer 1 "Clay brick": λ = 5 W/(m·K) is outside 0.08–3.5 W/(m·K), the plausible range for masonry (ISO 10456:2007, Table 3 (from memory): aerated block to dense stone).'
			}
		]);
	});
	it('flags, without a revision, insulation by its name', () => {
		const layer = { name: 'Mineral wool quilt', thicknessMm: 100, lambda: 0.12, mu: 1 };
		expect(lambdaImplausible(layerOf(layer))[0].reason).toBe(
			'Front wall (External wall), layer 1 "Mineral wool quilt": λ = 0.12 W/(m·K) is outside 0.015–0.065 W/(m·K), the plausible range for insulation (common practice, no source: foams, fibres, wood fibre, cork).'
		);
	});
	it('raises nothing inside the range, for an unknown material, or an air layer', () => {
		const { pir } = library();
		expect(lambdaImplausible(layerOf(linked(pir, 100), { rev: pir }))).toEqual([]);
		expect(lambdaImplausible(layerOf({ name: 'Unknown board', thicknessMm: 20, lambda: 9 }))).toEqual([]);
		expect(
			lambdaImplausible(layerOf({ name: 'Foam-lined cavity', thicknessMm: 50, air: 'unventilated' }))
		).toEqual([]);
	});
});

describe('insulationLayerTooThick', () => {
	it('flags one insulation layer over 600 mm', () => {
		const { pir } = library();
		expect(insulationLayerTooThick(layerOf(linked(pir, 650), { rev: pir, index: 2 }))).toEqual([
			{
				code: 'thickness-implausible',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 2,
				reason:
					'Front wall (External wall), layer 3 "PIR board" is 650 mm of insulation, more than the 600 mm that is plausible in one layer (common practice, no source).'
			}
		]);
	});
	it('raises nothing at 600 mm, or for a thick layer that is not insulation', () => {
		const { pir, brick } = library();
		expect(insulationLayerTooThick(layerOf(linked(pir, 600), { rev: pir }))).toEqual([]);
		expect(insulationLayerTooThick(layerOf(linked(brick, 650), { rev: brick }))).toEqual([]);
	});
});

describe('totalThicknessImplausible', () => {
	it('flags a build-up outside the plausible total for its kind', () => {
		const layers = [{ name: 'Render', thicknessMm: 20, lambda: 0.8, mu: 10 }];
		expect(
			totalThicknessImplausible(contextOf(element('e2', layers, { name: 'Thin wall' })), layers)
		).toEqual([
			{
				code: 'thickness-implausible',
				severity: 'medium',
				elementId: 'e2',
				reason:
					'Thin wall (External wall) is 20 mm thick in total; 60–1000 mm is plausible for this kind of element (common practice, no source: thin panels to thick solid stone walls).'
			}
		]);
		const party = [
			{ name: 'Dense block', thicknessMm: 350, lambda: 1.1 },
			{ name: 'Dense block', thicknessMm: 350.4, lambda: 1.1 }
		];
		expect(
			totalThicknessImplausible(
				contextOf(element('e3', party, { name: 'Party wall', kind: 'party-wall' })),
				party
			)[0].reason
		).toBe(
			'Party wall (Party wall) is 700 mm thick in total; 60–600 mm is plausible for this kind of element (common practice, no source).'
		);
	});
	it('raises nothing inside the range, or for an empty build-up', () => {
		const layers = [{ name: 'Brick', thicknessMm: 215, lambda: 0.77 }];
		expect(totalThicknessImplausible(contextOf(element('e1', layers)), layers)).toEqual([]);
		expect(totalThicknessImplausible(contextOf(element('e1', [])), [])).toEqual([]);
	});
});
