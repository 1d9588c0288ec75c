// The checks of a dwelling's junctions, one rule each, on given figures (the engine is not run here
// except in the last block). The audit's rules and tolerances are common practice, no source; the
// fRsi,min a junction is judged by is ISO 13788's (80 % surface humidity) as the engine computes it,
// and the 0.75 for dwellings is common practice, no source.
import { describe, it, expect } from 'vitest';
import {
	FRSI_TOLERANCE,
	PSI_TOLERANCE,
	junctionAddedAfterIssue,
	junctionChanged,
	junctionChangedAfterIssue,
	junctionContext,
	junctionFRsiBelowLimit,
	junctionRecomputeFailed,
	junctionRemovedAfterIssue,
	junctionsRemovedSinceIssue,
	psiEntered,
	psiWithoutSource
} from '../../../src/lib/audit/checks/junctions';
import { recomputeJunction, type JunctionCache } from '../../../src/lib/audit/junction-recompute';
import { FLAG_CODES, FLAG_LABELS } from '../../../src/lib/audit/flags';
import type { AuditReport, JunctionOutcome, SnapshotJunction } from '../../../src/lib/audit/types';
import {
	MONTHS,
	cleanWallLayers,
	element,
	enteredJunction,
	issuedReport,
	junction,
	snapshotJunctionOf
} from '../bundles';

const report = (junctions?: SnapshotJunction[]): AuditReport => ({
	...issuedReport(),
	snapshot: { elements: [], ...(junctions ? { junctions } : {}) }
});
const recorded = (over: Partial<SnapshotJunction> = {}): SnapshotJunction => ({
	...junction('j1'),
	psi: -0.075,
	fRsi: 0.898,
	...over
});
const figures = (over: Partial<JunctionOutcome> = {}): JunctionOutcome => ({
	psi: -0.075,
	fRsi: 0.898,
	fRsiMin: 0.776,
	criticalMonth: 12,
	surfacePass: true,
	ruleOfThumb: { value: 0.75, pass: true },
	...over
});

describe('every new flag code', () => {
	it('has a label', () => {
		for (const code of ['junction-changed', 'junction-frsi-below-limit', 'psi-entered', 'psi-without-source'])
			expect(FLAG_CODES).toContain(code);
		for (const code of FLAG_CODES) expect(FLAG_LABELS[code]).toMatch(/\w/);
	});
});

describe('junctionAddedAfterIssue', () => {
	it('flags a junction added after the report, and one the report could not record', () => {
		const j = junction('j1');
		expect(junctionAddedAfterIssue(junctionContext(j, undefined, report([])))).toEqual([
			{
				code: 'stale-report',
				severity: 'medium',
				junctionId: 'j1',
				reason: 'Junction "Corners" (External corner (walls)) was added after report R-1 was issued.'
			}
		]);
		expect(junctionAddedAfterIssue(junctionContext(j, undefined, report()))[0].reason).toMatch(
			/not in report R-1, which was issued before junctions were reported/
		);
	});
	it('raises nothing for a junction in the report, or without a report', () => {
		const j = junction('j1');
		expect(junctionAddedAfterIssue(junctionContext(j, recorded(), report([recorded()])))).toEqual([]);
		expect(junctionAddedAfterIssue(junctionContext(j, undefined, null))).toEqual([]);
	});
});

describe('junctionChangedAfterIssue', () => {
	it('names what of the junction changed: length, dimension system, build', () => {
		const j = junction('j1', {
			lengthM: 12,
			dimensionSystem: 'internal',
			details: { mode: 'builder', elements: { a: 'e1' }, gap: { widthMm: 40, lambda: 0.5 } }
		});
		const [flag] = junctionChangedAfterIssue(junctionContext(j, recorded(), report([recorded()])));
		expect(flag).toMatchObject({ code: 'stale-report', severity: 'medium', junctionId: 'j1' });
		expect(flag.reason).toBe(
			'Junction "Corners" (External corner (walls)): the length, dimension system, build changed after report R-1 was issued; the report no longer describes the junction.'
		);
	});
	it('names the source of an entered ψ, and leaves a change of ψ itself to junction-changed', () => {
		const was = { ...enteredJunction('j2', 0.3, 'Table A (test)'), psi: 0.3, fRsi: null };
		const ctx = (psiSource: string, psi: number) =>
			junctionContext(enteredJunction('j2', psi, psiSource), was, report([was]));
		expect(junctionChangedAfterIssue(ctx('Table B (test)', 0.3))[0].reason).toMatch(
			/the source named for the entered ψ changed/
		);
		expect(junctionChangedAfterIssue(ctx('Table A (test)', 0.25))).toEqual([]);
	});
});

describe('junctions removed since issue', () => {
	it('lists them with their issued figures and flags each', () => {
		const removed = junctionsRemovedSinceIssue(
			[recorded(), recorded({ id: 'j9', name: 'Old' })],
			[junction('j1')]
		);
		expect(removed).toEqual([
			{ id: 'j9', name: 'Old', type: 'external-corner', issued: { psi: -0.075, fRsi: 0.898 } }
		]);
		expect(junctionRemovedAfterIssue(removed, report([]))).toEqual([
			{
				code: 'stale-report',
				severity: 'medium',
				junctionId: 'j9',
				reason:
					'Junction "Old" (External corner (walls)) is in report R-1 but has since been removed from the dwelling.'
			}
		]);
	});
});

describe('junctionChanged', () => {
	const ctx = junctionContext(junction('j1'), recorded(), report([recorded()]));
	const issued = { psi: -0.075, fRsi: 0.898 };
	it('flags a ψ or an fRsi that moved by more than half a unit of the third decimal', () => {
		const [flag] = junctionChanged(ctx, issued, figures({ psi: -0.075 + 2 * PSI_TOLERANCE }));
		expect(flag).toMatchObject({ code: 'junction-changed', severity: 'medium', junctionId: 'j1' });
		expect(flag.reason).toBe(
			'Junction "Corners" (External corner (walls)), ψ on external dimensions: report R-1 gives ψ = -0.075 W/(m·K) and fRsi = 0.898; computed today from its choices and the dwelling\'s elements, ψ = -0.074 W/(m·K) and fRsi = 0.898 (ψ +0.001 W/(m·K)).'
		);
		expect(junctionChanged(ctx, issued, figures({ fRsi: 0.898 - 2 * FRSI_TOLERANCE }))[0].reason).toMatch(
			/fRsi -0\.001\)/
		);
	});
	it('raises nothing within the tolerance, without a report or without figures', () => {
		expect(junctionChanged(ctx, issued, figures({ psi: -0.075 + PSI_TOLERANCE / 2 }))).toEqual([]);
		expect(
			junctionChanged(junctionContext(junction('j1'), undefined, null), issued, figures({ psi: 1 }))
		).toEqual([]);
		expect(junctionChanged(ctx, null, figures())).toEqual([]);
		expect(junctionChanged(ctx, issued, null)).toEqual([]);
	});
});

describe('junctionFRsiBelowLimit', () => {
	const ctx = junctionContext(junction('j1'), undefined, null);
	it('flags an fRsi below the month’s fRsi,min (high)', () => {
		expect(junctionFRsiBelowLimit(ctx, figures({ fRsi: 0.7, surfacePass: false }))).toEqual([
			{
				code: 'junction-frsi-below-limit',
				severity: 'high',
				junctionId: 'j1',
				reason:
					'Junction "Corners" (External corner (walls)): fRsi = 0.700 is below the fRsi,min = 0.776 of December in the dwelling\'s climate (ISO 13788): risk of mould growth at the junction.'
			}
		]);
	});
	it('without a climate, flags an fRsi below 0.75 for dwellings (medium)', () => {
		const [flag] = junctionFRsiBelowLimit(
			ctx,
			figures({
				fRsi: 0.7,
				fRsiMin: null,
				criticalMonth: null,
				surfacePass: null,
				ruleOfThumb: { value: 0.75, pass: false }
			})
		);
		expect(flag).toMatchObject({ code: 'junction-frsi-below-limit', severity: 'medium' });
		expect(flag.reason).toMatch(/below the 0\.75 commonly used for dwellings \(common practice, no source\)/);
	});
	it('raises nothing at or above the limit', () => {
		expect(junctionFRsiBelowLimit(ctx, figures())).toEqual([]);
		expect(
			junctionFRsiBelowLimit(
				ctx,
				figures({ surfacePass: null, fRsiMin: null, ruleOfThumb: { value: 0.75, pass: true } })
			)
		).toEqual([]);
	});
});

describe('entered ψ-values', () => {
	const ctx = (source: string | null) => junctionContext(enteredJunction('j2', 0.3, source), undefined, null);
	it('psi-entered: every entered ψ, as not calculated here (low)', () => {
		expect(psiEntered(ctx('Table 3 of the scheme guide (test)'))).toEqual([
			{
				code: 'psi-entered',
				severity: 'low',
				junctionId: 'j2',
				reason:
					'Junction "Lintels" (Window head): ψ = 0.300 W/(m·K) is entered from “Table 3 of the scheme guide (test)”, not calculated here: check it against its source.'
			}
		]);
		expect(psiEntered(junctionContext(junction('j1'), undefined, null))).toEqual([]);
	});
	it('psi-without-source: a missing source, or one that names none (high)', () => {
		for (const source of [null, '', '  ', 'n/a', 'N/A', '?', '—', 'tbc', 'unknown', 'default', 'ab'])
			expect(psiWithoutSource(ctx(source)), String(source)).toMatchObject([
				{ code: 'psi-without-source', severity: 'high', junctionId: 'j2' }
			]);
		for (const source of [
			'Table 3 (test)',
			'Default table value, assumed (test)',
			'Detail 4 of the scheme’s guide (test)'
		])
			expect(psiWithoutSource(ctx(source)), source).toEqual([]);
	});
});

describe('junctionRecomputeFailed and recomputeJunction', () => {
	const wall = element('e1', cleanWallLayers());
	it('computes a junction from the stored choices, once per cache, as the report did', () => {
		const cache: JunctionCache = new Map();
		const j = junction('j1');
		const now = recomputeJunction(j, [wall], MONTHS, cache);
		const issued = snapshotJunctionOf(j, [wall], MONTHS);
		expect(now).toMatchObject({ psi: issued.psi, fRsi: issued.fRsi, criticalMonth: expect.any(Number) });
		expect(cache.size).toBe(1);
		// a renamed element changes nothing the figures depend on
		recomputeJunction(j, [{ ...wall, name: 'Renamed' }], MONTHS, cache);
		expect(cache.size).toBe(1);
		expect(recomputeJunction(enteredJunction('j2', 0.3, 'x'), [wall], MONTHS, cache)).toBeNull();
	});
	it('says field by field why a junction cannot be computed, and flags it (high)', () => {
		const lost = junction('j3', { details: { mode: 'builder', elements: { a: 'gone' } } });
		const out = recomputeJunction(lost, [wall], MONTHS, new Map());
		expect(out).toEqual({ error: 'details.elements.a: is not an element of this dwelling' });
		expect(
			junctionRecomputeFailed(junctionContext(lost, undefined, null), (out as { error: string }).error)
		).toEqual([
			{
				code: 'recompute-failed',
				severity: 'high',
				junctionId: 'j3',
				reason:
					'Junction "Corners" (External corner (walls)) could not be recomputed: details.elements.a: is not an element of this dwelling.'
			}
		]);
		expect(junctionRecomputeFailed(junctionContext(lost, undefined, null), undefined)).toEqual([]);
	});
});
