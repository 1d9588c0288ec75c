// The checks against the issued report. When a report is stale, missing or an element was added or
// removed is the audit's own rule: common practice, no source.
import { describe, it, expect } from 'vitest';
import {
	addedAfterIssue,
	changedAfterIssue,
	changesSinceIssue,
	notIssued,
	removedAfterIssue,
	removedSinceIssue
} from '../../../src/lib/audit/checks/report';
import { MONTHS, cleanWallLayers, contextOf, element, glazed, issuedReport, snapshotOf } from '../bundles';

const climates = new Map([['c1', MONTHS]]);

describe('notIssued', () => {
	it('flags a dwelling without an issued report', () => {
		expect(notIssued(null)).toEqual([
			{
				code: 'not-issued',
				severity: 'high',
				reason: 'No dwelling report has been issued, so there are no issued numbers to check against.'
			}
		]);
	});
	it('raises nothing once a report is issued', () => {
		expect(notIssued(issuedReport())).toEqual([]);
	});
});

describe('addedAfterIssue', () => {
	it('flags an element the report does not record', () => {
		const ctx = contextOf(element('e1', cleanWallLayers()), { report: issuedReport() });
		expect(addedAfterIssue(ctx)).toEqual([
			{
				code: 'stale-report',
				severity: 'medium',
				elementId: 'e1',
				reason: 'Front wall (External wall) was added after report R-1 was issued.'
			}
		]);
	});
	it('raises nothing for a recorded element, or without a report', () => {
		const el = element('e1', cleanWallLayers());
		const snapshot = snapshotOf(el, climates, 'c1');
		expect(addedAfterIssue(contextOf(el, { report: issuedReport([snapshot]), snapshot }))).toEqual([]);
		expect(addedAfterIssue(contextOf(el))).toEqual([]);
	});
});

describe('changedAfterIssue', () => {
	it('names every input that changed since the report recorded it', () => {
		const el = element('e1', cleanWallLayers());
		const snapshot = snapshotOf(el, climates, 'c1');
		const now = {
			...el,
			kind: 'party-wall' as const,
			area: 21,
			heatFlow: 'upward' as const,
			internal: { temperature: 21, humidityClass: 3 as const },
			climateId: 'c2'
		};
		now.buildUp = { layers: now.buildUp!.layers.map((l, i) => (i === 2 ? { ...l, thicknessMm: 120 } : l)) };
		const ctx = contextOf(now, { report: issuedReport([snapshot]), snapshot });
		expect(changesSinceIssue(ctx, 'c1')).toEqual([
			'kind',
			'area',
			'heat-flow direction',
			'build-up',
			'internal conditions',
			'climate'
		]);
		expect(changedAfterIssue(ctx, 'c1')).toEqual([
			{
				code: 'stale-report',
				severity: 'medium',
				elementId: 'e1',
				reason:
					'Front wall (Party wall): the kind, area, heat-flow direction, build-up, internal conditions, climate changed after report R-1 was issued; the report no longer describes the element.'
			}
		]);
	});
	it('sees a given U that was added or changed', () => {
		const w = glazed('w1', null);
		const snapshot = snapshotOf(w, climates, 'c1');
		const ctx = contextOf({ ...w, givenU: 1.4 }, { report: issuedReport([snapshot]), snapshot });
		expect(changesSinceIssue(ctx, 'c1')).toEqual(['given U-value']);
	});
	it('raises nothing for an unchanged element, for noise-sized differences, or a climate taken from the dwelling', () => {
		const el = element('e1', cleanWallLayers(), { climateId: null });
		const snapshot = snapshotOf(el, climates, 'c1');
		// 1e-12 m² is floating-point noise, not a change (common practice, no source)
		const ctx = contextOf({ ...el, area: el.area + 1e-12 }, { report: issuedReport([snapshot]), snapshot });
		expect(changedAfterIssue(ctx, 'c1')).toEqual([]);
	});
});

describe('removedAfterIssue', () => {
	it('flags each element the report records that the dwelling no longer has', () => {
		const kept = element('e1', cleanWallLayers());
		const gone = element('e2', cleanWallLayers(), { name: 'Lean-to wall' });
		const report = issuedReport([snapshotOf(kept, climates, 'c1'), snapshotOf(gone, climates, 'c1')]);
		const removed = removedSinceIssue(report.snapshot.elements!, [kept]);
		expect(removed.map((r) => r.id)).toEqual(['e2']);
		expect(removed[0].issued!.u).toBe(report.snapshot.elements![1].result!.uValue);
		expect(removedAfterIssue(removed, report)).toEqual([
			{
				code: 'stale-report',
				severity: 'medium',
				reason: 'Lean-to wall (External wall) is in report R-1 but has since been removed from the dwelling.'
			}
		]);
	});
	it('raises nothing when every recorded element is still there', () => {
		const kept = element('e1', cleanWallLayers());
		const report = issuedReport([snapshotOf(kept, climates, 'c1')]);
		expect(removedAfterIssue(removedSinceIssue(report.snapshot.elements!, [kept]), report)).toEqual([]);
	});
});
