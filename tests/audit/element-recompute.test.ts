// The recalculations of the audit: which library revision each layer uses and how its values replace
// the entered ones. Values are generic (common practice, no source).
import { describe, it, expect } from 'vitest';
import { layerFromRevision, layerRevisions } from '../../src/lib/audit/element-recompute';
import { library, linked, rev } from './bundles';

describe('layerFromRevision', () => {
	it("takes λ or R and μ or sd from the revision, keeping an air layer's own resistance", () => {
		const { brick } = library();
		expect(layerFromRevision({ name: 'Brick', thicknessMm: 102, lambda: 0.6, sd: 1 }, brick)).toEqual({
			name: 'Brick',
			thicknessMm: 102,
			lambda: 0.77,
			mu: 10
		});
		const vcl = rev('vcl', { lambda: null, resistance: 0.02, muDry: null, sd: 50 });
		expect(layerFromRevision({ name: 'VCL', thicknessMm: 0.2, lambda: 0.3, mu: 100 }, vcl)).toEqual({
			name: 'VCL',
			thicknessMm: 0.2,
			resistance: 0.02,
			sd: 50
		});
		const air = { name: 'Cavity', thicknessMm: 50, air: 'unventilated' as const };
		expect(layerFromRevision(air, rev('cavity', { lambda: 0.5, muDry: 1 }))).toEqual({ ...air, mu: 1 });
	});
});

describe('layerRevisions', () => {
	it('finds the revision used and the current one, by material or by the revision’s material', () => {
		const { pir, block } = library();
		const pir2 = rev('pir2', { ...pir, id: 'pir2', revision: 2 });
		const { materialRevisionId: _, ...byMaterial } = linked(pir, 100);
		const { materialId: __, ...byRevision } = linked(block, 100);
		const b = {
			revisions: new Map([pir, pir2, block].map((r) => [r.id, r])),
			currentRevisions: new Map([
				[pir.materialId, pir2],
				[block.materialId, block]
			])
		};
		const revs = layerRevisions([byMaterial, byRevision], b);
		expect([revs.used(0), revs.current(0)?.id]).toEqual([undefined, 'pir2']);
		expect([revs.used(1)?.id, revs.current(1)?.id]).toEqual(['block', 'block']);
		// a layer with no revision of its own takes the current one: the library moved, nothing was replaced
		expect(revs.moved()).toBe(true);
		expect(revs.replaced()).toBe(false);
		const linkedPir = layerRevisions([linked(pir, 100)], b);
		expect([linkedPir.moved(), linkedPir.replaced()]).toEqual([true, true]);
		const current = layerRevisions([linked(block, 100)], b);
		expect([current.moved(), current.replaced()]).toEqual([false, false]);
	});
});
