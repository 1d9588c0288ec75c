// The checks of issued numbers. A U counts as different beyond U_TOLERANCE = 0.005 W/(m²·K), half a
// unit in the second decimal (common practice, no source); outcomes are given here, not computed.
import { describe, it, expect } from 'vitest';
import { ElementInputError } from '../../../src/lib/physics';
import {
	issuedInputFails,
	issuedNumbersDiffer,
	libraryChanged
} from '../../../src/lib/audit/checks/reproduction';
import { cleanWallLayers, contextOf, element, issuedReport, outcome } from '../bundles';

const ctx = () => contextOf(element('e1', cleanWallLayers()), { report: issuedReport() });

describe('issuedInputFails', () => {
	it('flags a stored input that no longer calculates, naming each invalid field', () => {
		const error = new ElementInputError([{ path: 'layers', message: 'at least one layer is required' }]);
		expect(issuedInputFails(ctx(), { error })).toEqual([
			{
				code: 'not-reproducing',
				severity: 'high',
				elementId: 'e1',
				reason:
					'Front wall (External wall): the input stored with report R-1 no longer calculates: layers: at least one layer is required'
			}
		]);
	});
	it('raises nothing when it calculates, or when there is nothing to calculate', () => {
		expect(issuedInputFails(ctx(), { outcome: outcome() })).toEqual([]);
		expect(issuedInputFails(ctx(), { outcome: null })).toEqual([]);
	});
});

describe('issuedNumbersDiffer', () => {
	it('flags an issued U that differs from the reproduced one, with the signed difference', () => {
		expect(issuedNumbersDiffer(ctx(), outcome({ u: 0.2 }), outcome({ u: 0.18 }))).toEqual([
			{
				code: 'not-reproducing',
				severity: 'high',
				elementId: 'e1',
				reason:
					'Front wall (External wall): report R-1 gives U = 0.200; recomputed with the revisions it used, U = 0.180 W/(m²·K) (difference -0.020).'
			}
		]);
		expect(issuedNumbersDiffer(ctx(), outcome({ u: 0.16 }), outcome({ u: 0.18 }))[0].reason).toContain(
			'(difference +0.020)'
		);
	});
	it('flags, when U agrees, a different condensation outcome', () => {
		const issued = outcome({ condensation: 'accumulates' });
		expect(issuedNumbersDiffer(ctx(), issued, outcome({ condensation: 'dries' }))[0].reason).toBe(
			'Front wall (External wall): report R-1 says the interstitial condensation outcome is "accumulates"; recomputed it is "dries".'
		);
	});
	it('raises nothing within the tolerance, without an outcome, or without a condensation check', () => {
		expect(issuedNumbersDiffer(ctx(), outcome({ u: 0.184 }), outcome({ u: 0.18 }))).toEqual([]);
		expect(issuedNumbersDiffer(ctx(), outcome(), null)).toEqual([]);
		expect(issuedNumbersDiffer(ctx(), null, outcome())).toEqual([]);
		expect(issuedNumbersDiffer(ctx(), outcome({ condensation: null }), outcome())).toEqual([]);
	});
});

describe('libraryChanged', () => {
	it("flags a U the library's current revisions would change", () => {
		expect(libraryChanged(ctx(), outcome({ u: 0.18 }), outcome({ u: 0.206 }), true)).toEqual([
			{
				code: 'library-changed',
				severity: 'low',
				elementId: 'e1',
				reason:
					"Front wall (External wall): with the library's current revisions U would be 0.206 instead of the issued 0.180 W/(m²·K)."
			}
		]);
	});
	it('raises nothing within the tolerance, when no revision was replaced, or without a current U', () => {
		expect(libraryChanged(ctx(), outcome({ u: 0.18 }), outcome({ u: 0.184 }), true)).toEqual([]);
		expect(libraryChanged(ctx(), outcome({ u: 0.18 }), outcome({ u: 0.23 }), false)).toEqual([]);
		expect(libraryChanged(ctx(), outcome({ u: 0.18 }), null, true)).toEqual([]);
	});
});
