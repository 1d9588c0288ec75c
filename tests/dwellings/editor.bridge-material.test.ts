import { describe, expect, it } from 'vitest';
import { blankRow, layerFromRow, rowFromLayer } from '../../src/lib/dwellings/editor';
import { storedBuildUpSchema, storedLayerSchema } from '../../src/lib/dwellings/schema';
import { toEngineLayer } from '../../src/lib/dwellings/element-input';

// The bridging material picked from the library is recorded the way a layer records its own
// material (id, revision, code); the engine never sees the link. Invented ids and values; only their
// survival is tested.
const MAT = '00000000-0000-4000-8000-0000000000a1';
const REV = '00000000-0000-4000-8000-0000000000a2';

const studRow = () =>
	blankRow({
		name: 'Mineral wool between studs',
		thickness: '140',
		lambda: '0.035',
		mu: '1',
		bridged: true,
		bridgeBy: 'geometry',
		bridgeName: 'Softwood stud',
		bridgeLambda: '0.13',
		bridgeMu: '50',
		bridgeWidth: '38',
		bridgeCentres: '600',
		bridgeMaterialId: MAT,
		bridgeMaterialRevisionId: REV,
		bridgeMaterialCode: 'T-SW-013'
	});

describe('the bridging material from the library', () => {
	it('is stored with the layer and read back into the row', () => {
		const layer = layerFromRow(studRow());
		expect(layer.bridgeMaterial).toEqual({
			materialId: MAT,
			materialRevisionId: REV,
			materialCode: 'T-SW-013'
		});
		expect(layer.bridge).toMatchObject({ name: 'Softwood stud', lambda: 0.13, mu: 50 });
		const parsed = storedLayerSchema.parse(layer);
		expect(parsed.bridgeMaterial).toEqual(layer.bridgeMaterial);
		const back = rowFromLayer(parsed);
		expect(back.bridgeMaterialId).toBe(MAT);
		expect(back.bridgeMaterialRevisionId).toBe(REV);
		expect(back.bridgeMaterialCode).toBe('T-SW-013');
		expect(back.bridgeLambda).toBe('0.13');
	});

	it('survives the build-up schema (that of elements and templates alike)', () => {
		const buildUp = storedBuildUpSchema.parse({ layers: [layerFromRow(studRow())] });
		expect(buildUp.layers[0].bridgeMaterial?.materialCode).toBe('T-SW-013');
	});

	it('is optional: a typed bridging λ without a library link works as before', () => {
		const row = {
			...studRow(),
			bridgeMaterialId: undefined,
			bridgeMaterialRevisionId: undefined,
			bridgeMaterialCode: undefined
		};
		const layer = layerFromRow(row);
		expect(layer.bridgeMaterial).toBeUndefined();
		expect(storedLayerSchema.safeParse(layer).success).toBe(true);
		expect(layer.bridge?.lambda).toBe(0.13);
	});

	it('is dropped with the bridging when the layer is no longer bridged', () => {
		expect(layerFromRow({ ...studRow(), bridged: false }).bridgeMaterial).toBeUndefined();
	});

	it('refuses a link that is not a material id', () => {
		const r = storedLayerSchema.safeParse({
			...layerFromRow(studRow()),
			bridgeMaterial: { materialId: 'stud' }
		});
		expect(r.success).toBe(false);
		expect(r.error?.issues[0].path.join('.')).toBe('bridgeMaterial.materialId');
	});

	it('the engine does not see it', () => {
		const engine = toEngineLayer(storedLayerSchema.parse(layerFromRow(studRow())));
		expect(engine).not.toHaveProperty('bridgeMaterial');
		expect(engine.bridge?.fraction).toBeCloseTo(38 / 600, 12);
	});
});
