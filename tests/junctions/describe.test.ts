// A junction's model in words, as the report prints it: our own wording (common practice, no source);
// the model is the builder's, built from a generic cavity wall invented for these tests.
import { describe, expect, it } from 'vitest';
import {
	describeJunctionModel,
	elementInWords,
	environmentsInWords,
	modelMaterials
} from '../../src/lib/junctions/describe';
import { runJunction, type ElementLike } from '../../src/lib/junctions/run';
import { CAVITY_WALL } from './fixtures';

const WALL: ElementLike & { buildUp: NonNullable<ElementLike['buildUp']> } = {
	id: 'w1',
	name: 'Cavity wall',
	kind: 'external-wall',
	heatFlow: 'horizontal',
	buildUp: { layers: CAVITY_WALL.layers },
	givenU: null
};

describe('a junction in words', () => {
	it('names the elements, the details, the materials with λ and the environments', () => {
		const details = {
			mode: 'builder' as const,
			elements: { a: 'w1' },
			insulationLayer: 2,
			gap: { widthMm: 50, lambda: 0.5 },
			insert: {
				name: 'Steel lintel',
				lambda: 50,
				alongFromMm: 0,
				lengthMm: 200,
				depthFromMm: 113,
				depthToMm: 120
			}
		};
		const run = runJunction({
			type: 'external-corner',
			dimensionSystem: 'external',
			details,
			elements: [WALL],
			months: null
		});
		if (!run.ok) throw new Error(JSON.stringify(run.issues));
		const words = describeJunctionModel({ type: 'external-corner', details, model: run.model }, [WALL]);
		expect(words[0]).toBe(
			'External corner (walls), built from the dwelling’s own elements: “Cavity wall” (external wall, 4 layers, 313 mm) meeting the same wall again, each with its layers, inside to outside, as rectangles of material.'
		);
		expect(words[1]).toBe(
			'Details: its main insulation taken as layer 3 “Mineral wool” of the first element, a 50 mm gap in that insulation at the junction, filled with a material of λ 0.5 W/(m·K) and “Steel lintel” of λ 50 W/(m·K), 200 mm long from 0 mm along the element and 113–120 mm from its inside face.'
		);
		expect(words[2]).toMatch(/^Materials, W\/\(m·K\): .*Mineral wool λ 0\.035.*Steel lintel λ 50/);
		expect(words[3]).toMatch(
			/^Its boundaries face inside \(20\.0 °C, Rs 0\.13 m²·K\/W\) and outside \(−5\.0 °C, Rs 0\.04 m²·K\/W\)/
		);
	});

	it('a free-form model: its rectangles, a fixed surface temperature said so', () => {
		const model = {
			regions: [
				{ name: 'Slab', x0: 0, y0: 0, x1: 1000, y1: 200, lambda: 2 },
				{ name: 'Slab', x0: 1000, y0: 0, x1: 2000, y1: 200, lambda: 2 },
				{ x0: 0, y0: 200, x1: 2000, y1: 300, lambda: 0.04 }
			],
			boundaries: [
				{ from: [0, 0] as [number, number], to: [2000, 0] as [number, number], environment: 'ground' },
				{ from: [0, 300] as [number, number], to: [2000, 300] as [number, number], environment: 'room' }
			],
			environments: { room: { temperature: 20, rs: 0.17 }, ground: { temperature: 10, rs: 0 } }
		};
		expect(modelMaterials(model)).toEqual([
			{ name: 'Slab', lambda: 2, regions: 2 },
			{ name: 'Rectangle 3', lambda: 0.04, regions: 1 }
		]);
		expect(environmentsInWords(model)).toBe(
			'room (20.0 °C, Rs 0.17 m²·K/W) and ground (10.0 °C, surface temperature fixed)'
		);
		const words = describeJunctionModel(
			{ type: 'other', details: { mode: 'free-form', elements: {} }, model },
			[]
		);
		expect(words[0]).toMatch(/^A free-form model of 3 rectangles of material/);
	});

	it('an element with its layers, or a window by its given U', () => {
		expect(elementInWords(WALL)).toBe(
			'“Cavity wall” (external wall, 313 mm: 13 mm Plaster, 100 mm Block, 100 mm Mineral wool, 100 mm Brick)'
		);
		expect(elementInWords({ id: 'x', name: 'Window', kind: 'window', buildUp: null, givenU: 1.4 })).toBe(
			'“Window” (window, given U 1.4 W/(m²·K))'
		);
	});
});
