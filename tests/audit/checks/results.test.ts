// The checks of a recomputed result. Limits are invented for the tests; "meets the limit" allows only
// floating-point room (LIMIT_TOLERANCE, common practice, no source). The moisture criteria are those
// of ISO 13788 as the engine computes them; here the outcomes are given, not computed.
import { describe, it, expect } from 'vitest';
import {
	condensationAccumulates,
	givenUOverLimit,
	nothingToCompute,
	recomputeFailed,
	surfaceMouldRisk,
	uOverLimit
} from '../../../src/lib/audit/checks/results';
import { cleanWallLayers, contextOf, element, glazed, outcome } from '../bundles';

const wall = () => contextOf(element('e1', cleanWallLayers())); // limit 0.3 W/(m²·K) (Test limits 1)

describe('nothingToCompute', () => {
	it('flags an element with neither a build-up nor a given U', () => {
		expect(nothingToCompute(contextOf(glazed('d1', null, { name: 'Back door', kind: 'door' })))).toEqual([
			{
				code: 'recompute-failed',
				severity: 'high',
				elementId: 'd1',
				reason: 'Back door (Door) has neither a build-up nor a given U-value.'
			}
		]);
	});
	it('raises nothing with a given U', () => {
		expect(nothingToCompute(contextOf(glazed('w1', 1.4)))).toEqual([]);
	});
});

describe('recomputeFailed', () => {
	it('flags a build-up the engine refuses, with its reason', () => {
		expect(recomputeFailed(wall(), 'layers.0.thicknessMm: must be > 0')).toEqual([
			{
				code: 'recompute-failed',
				severity: 'high',
				elementId: 'e1',
				reason: 'Front wall (External wall) could not be recomputed: layers.0.thicknessMm: must be > 0'
			}
		]);
	});
	it('raises nothing when it calculated', () => {
		expect(recomputeFailed(wall(), undefined)).toEqual([]);
	});
});

describe('givenUOverLimit', () => {
	it('flags a given U over the limit, naming the table', () => {
		expect(givenUOverLimit(contextOf(glazed('w1', 2.8)))).toEqual([
			{
				code: 'u-over-limit',
				severity: 'high',
				elementId: 'w1',
				reason:
					'Window (Window): the given U = 2.80 W/(m²·K) is over the limit of 1.6 W/(m²·K) (Test limits 1).'
			}
		]);
	});
	it('raises nothing at the limit, without a limit or without a given U', () => {
		expect(givenUOverLimit(contextOf(glazed('w1', 1.6)))).toEqual([]);
		expect(givenUOverLimit(contextOf(glazed('w1', 2.8), { limitTable: null }))).toEqual([]);
		expect(givenUOverLimit(contextOf(glazed('w1', null)))).toEqual([]);
	});
});

describe('uOverLimit', () => {
	it('flags a reported (rounded) U over the limit; a table without a name is not named', () => {
		expect(uOverLimit(wall(), outcome({ u: 0.3149, uRounded: 0.31 }))[0].reason).toBe(
			'Front wall (External wall): U = 0.31 W/(m²·K) is over the limit of 0.3 W/(m²·K) (Test limits 1).'
		);
		const unnamed = contextOf(element('e1', cleanWallLayers()), {
			limitTable: { name: '', edition: '', limits: { 'external-wall': 0.3 } }
		});
		expect(uOverLimit(unnamed, outcome({ u: 0.31, uRounded: 0.31 }))).toEqual([
			{
				code: 'u-over-limit',
				severity: 'high',
				elementId: 'e1',
				reason: 'Front wall (External wall): U = 0.31 W/(m²·K) is over the limit of 0.3 W/(m²·K).'
			}
		]);
	});
	it('raises nothing when the reported U meets the limit, though the unrounded one is above it', () => {
		expect(uOverLimit(wall(), outcome({ u: 0.3049, uRounded: 0.3 }))).toEqual([]);
		expect(uOverLimit(contextOf(element('e1', []), { limitTable: null }), outcome({ uRounded: 9 }))).toEqual(
			[]
		);
	});
});

describe('condensationAccumulates', () => {
	it('flags condensation that does not dry out over the year', () => {
		expect(condensationAccumulates(wall(), outcome({ condensation: 'accumulates' }))).toEqual([
			{
				code: 'condensation-accumulates',
				severity: 'high',
				elementId: 'e1',
				reason:
					'Front wall (External wall): interstitial condensation builds up over the year and does not dry out (Glaser method, ISO 13788).'
			}
		]);
	});
	it('raises nothing for condensation that dries out, none, or no check', () => {
		for (const condensation of ['dries', 'none', null] as const)
			expect(condensationAccumulates(wall(), outcome({ condensation }))).toEqual([]);
	});
});

describe('surfaceMouldRisk', () => {
	it('flags fRsi below fRsi,min', () => {
		expect(surfaceMouldRisk(wall(), outcome({ surfacePass: false, fRsi: 0.4083, fRsiMin: 0.9271 }))).toEqual([
			{
				code: 'surface-mould-risk',
				severity: 'high',
				elementId: 'e1',
				reason:
					'Front wall (External wall): the temperature factor fRsi = 0.408 is below the 0.927 needed to avoid surface mould (ISO 13788).'
			}
		]);
	});
	it('raises nothing when the surface passes or was not checked', () => {
		expect(surfaceMouldRisk(wall(), outcome({ surfacePass: true }))).toEqual([]);
		expect(surfaceMouldRisk(wall(), outcome({ surfacePass: null }))).toEqual([]);
	});
});
