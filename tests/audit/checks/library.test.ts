// The checks of the library revisions layers name. Which revision is current, verified or generic is
// the library's record; the audit's rules on them are common practice, no source. Values are generic
// (common practice, no source).
import { describe, it, expect } from 'vitest';
import {
	genericLambdas,
	newLibraryUses,
	noteUse,
	revisionMissing,
	revisionSuperseded,
	unverifiedRevisions,
	valuesDifferFromRevision
} from '../../../src/lib/audit/checks/library';
import { element, layerOf, library, linked, rev } from '../bundles';

describe('revisionMissing', () => {
	it('flags a layer naming a revision the library does not hold', () => {
		const ghost = rev('ghost', { name: 'Lost board' });
		expect(revisionMissing(layerOf(linked(ghost, 20), { index: 3 }))).toEqual([
			{
				code: 'material-unverified',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 3,
				reason:
					'Front wall (External wall), layer 4 "Lost board" names a library revision that is not in the library.'
			}
		]);
	});
	it('raises nothing for a revision in the library, or a layer not linked to one', () => {
		const { brick } = library();
		expect(revisionMissing(layerOf(linked(brick, 102), { rev: brick }))).toEqual([]);
		expect(revisionMissing(layerOf({ name: 'Brick', thicknessMm: 102, lambda: 0.77 }))).toEqual([]);
	});
});

describe('revisionSuperseded', () => {
	it('flags a revision replaced by a newer current one, naming it', () => {
		const { pir } = library();
		const pir2 = rev('pir2', { ...pir, id: 'pir2', revision: 2, lambda: 0.026 });
		expect(revisionSuperseded(layerOf(linked(pir, 100), { rev: pir, current: pir2, index: 2 }))).toEqual([
			{
				code: 'material-superseded',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 2,
				reason:
					'Front wall (External wall), layer 3 "PIR board" uses PIR revision 1 (λ 0.022), which has been superseded; the current revision is 2 (λ 0.026).'
			}
		]);
	});
	it('flags a revision marked superseded, and one without code or λ', () => {
		const brick = rev('brick', { name: 'Clay brick', status: 'superseded' });
		expect(revisionSuperseded(layerOf(linked(brick, 102), { rev: brick, current: brick }))[0].reason).toBe(
			'Front wall (External wall), layer 1 "Clay brick" uses BRICK revision 1 (λ 0.77), which has been superseded.'
		);
		const vcl = rev('vcl', {
			name: 'Membrane',
			code: null,
			lambda: null,
			resistance: 0,
			muDry: null,
			sd: 50
		});
		const vcl2 = rev('vcl2', { ...vcl, id: 'vcl2', revision: 2 });
		expect(revisionSuperseded(layerOf(linked(vcl, 0.2), { rev: vcl, current: vcl2 }))[0].reason).toBe(
			'Front wall (External wall), layer 1 "Membrane" uses revision 1, which has been superseded; the current revision is 2.'
		);
	});
	it('raises nothing for the current, verified revision or an unlinked layer', () => {
		const { brick } = library();
		expect(revisionSuperseded(layerOf(linked(brick, 102), { rev: brick, current: brick }))).toEqual([]);
		expect(revisionSuperseded(layerOf({ name: 'Brick', thicknessMm: 102, lambda: 0.77 }))).toEqual([]);
	});
});

describe('valuesDifferFromRevision', () => {
	it('flags λ and μ changed by hand', () => {
		const { block } = library();
		expect(
			valuesDifferFromRevision(layerOf(linked(block, 100, { lambda: 0.11, mu: 5 }), { rev: block }))
		).toEqual([
			{
				code: 'values-differ-from-revision',
				severity: 'medium',
				elementId: 'e1',
				layerIndex: 0,
				reason:
					'Front wall (External wall), layer 1 "Aerated block": λ 0.11 instead of 0.15, μ 5 instead of 10 of BLOCK revision 1; the entered values were changed by hand.'
			}
		]);
	});
	it('flags R changed by hand for a revision given by its resistance', () => {
		const vcl = rev('vcl', { name: 'Membrane', lambda: null, resistance: 0.02, muDry: null, sd: 50 });
		expect(
			valuesDifferFromRevision(layerOf(linked(vcl, 0.2, { resistance: 0.05 }), { rev: vcl }))[0].reason
		).toBe(
			'Front wall (External wall), layer 1 "Membrane": R 0.05 instead of 0.02 of VCL revision 1; the entered values were changed by hand.'
		);
	});
	it('raises nothing for copied values, floating-point noise, or an air layer', () => {
		const { brick } = library();
		expect(valuesDifferFromRevision(layerOf(linked(brick, 102), { rev: brick }))).toEqual([]);
		expect(
			valuesDifferFromRevision(layerOf(linked(brick, 102, { lambda: 0.77 + 1e-12 }), { rev: brick }))
		).toEqual([]);
		const cavity = rev('cavity', { name: 'Cavity', lambda: 0.5, muDry: 1 });
		const air = linked(cavity, 50, { lambda: undefined, air: 'unventilated' });
		expect(valuesDifferFromRevision(layerOf(air, { rev: cavity }))).toEqual([]);
	});
});

describe('unverifiedRevisions', () => {
	it('flags each unverified revision once, naming every place it is used', () => {
		const brick = rev('brick', { name: 'Clay brick', status: 'unverified' });
		const block = rev('block', { name: 'Aerated block', status: 'unverified', code: null });
		const uses = newLibraryUses();
		const front = element('e1', []);
		const rear = element('e2', [], { name: 'Rear wall' });
		noteUse(uses, layerOf(linked(block, 100), { rev: block, index: 1, element: front }));
		noteUse(uses, layerOf(linked(brick, 102), { rev: brick, index: 4, element: front }));
		noteUse(uses, layerOf(linked(brick, 102), { rev: brick, index: 2, element: rear }));
		noteUse(uses, layerOf(linked(brick, 102), { rev: brick, index: 3, element: rear }));
		expect(unverifiedRevisions(uses.unverified)).toEqual([
			{
				code: 'material-unverified',
				severity: 'medium',
				elementId: 'e1',
				reason:
					'"Aerated block" revision 1, used in Front wall layer 2, has not been verified against its source.'
			},
			{
				code: 'material-unverified',
				severity: 'medium',
				elementId: 'e1',
				reason:
					'BRICK "Clay brick" revision 1, used in Front wall layer 5, Rear wall layer 3 and Rear wall layer 4, has not been verified against its source.'
			}
		]);
	});
	it('raises nothing for verified revisions', () => {
		const uses = newLibraryUses();
		const { brick } = library();
		noteUse(uses, layerOf(linked(brick, 102), { rev: brick }));
		expect(unverifiedRevisions(uses.unverified)).toEqual([]);
	});
});

describe('genericLambdas', () => {
	it('flags insulation carrying a table λ once, naming every place', () => {
		const pir = rev('pir', { name: 'PIR board', category: 'insulation', lambda: 0.022, lambdaKind: 'table' });
		const uses = newLibraryUses();
		noteUse(uses, layerOf(linked(pir, 100), { rev: pir, index: 2 }));
		noteUse(
			uses,
			layerOf(linked(pir, 50), { rev: pir, index: 3, element: element('e3', [], { name: 'Loft' }) })
		);
		expect(genericLambdas(uses.generic)).toEqual([
			{
				code: 'generic-lambda',
				severity: 'low',
				elementId: 'e1',
				reason:
					'PIR "PIR board", used in Front wall layer 3 and Loft layer 4, carries a generic table λ (0.022 W/(m·K)) for an insulation product; a declared value from the product\'s documentation is expected.'
			}
		]);
	});
	it('raises nothing for declared insulation or a table λ of another category', () => {
		const uses = newLibraryUses();
		const { pir } = library();
		const brick = rev('brick', { lambdaKind: 'table' });
		noteUse(uses, layerOf(linked(pir, 100), { rev: pir }));
		noteUse(uses, layerOf(linked(brick, 102), { rev: brick }));
		expect(genericLambdas(uses.generic)).toEqual([]);
	});
});
