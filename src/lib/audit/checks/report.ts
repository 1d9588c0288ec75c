/** Checks of the dwelling against its latest issued report: is there one, and does it still describe the dwelling. */
import type { Flag } from '$lib/audit/flags';
import type { AuditElement, AuditReport, RemovedElement, SnapshotElement } from '$lib/audit/types';
import { outcomeOf } from '$lib/audit/element-recompute';
import { canonical, different } from '$lib/audit/compare';
import { elementFlag, kindLabel, type ElementContext } from './context';

/**
 * `not-issued`: the dwelling has no issued report. An audit checks issued numbers, so there is nothing
 * to check against (common practice, no source).
 */
export function notIssued(report: AuditReport | null): Flag[] {
	if (report) return [];
	return [
		{
			code: 'not-issued',
			severity: 'high',
			reason: 'No dwelling report has been issued, so there are no issued numbers to check against.'
		}
	];
}

/**
 * `stale-report`: an element added to the dwelling after its report was issued; the report does not
 * describe it (common practice, no source).
 */
export function addedAfterIssue(ctx: ElementContext): Flag[] {
	if (!ctx.report || ctx.snapshot) return [];
	return [
		elementFlag(
			ctx,
			'stale-report',
			'medium',
			`${ctx.at} was added after report ${ctx.report.number} was issued.`
		)
	];
}

/**
 * What of an element changed since the report recorded it, in words: kind, area, heat-flow direction,
 * build-up, internal conditions, climate (of a build-up; `dwellingClimateId` when the element names
 * none) and given U-value.
 */
export function changesSinceIssue(ctx: ElementContext, dwellingClimateId: string | null): string[] {
	const el = ctx.element;
	const snap = ctx.snapshot;
	if (!snap) return [];
	const changed: string[] = [];
	if (snap.kind !== el.kind) changed.push('kind');
	if (different(snap.area, el.area)) changed.push('area');
	if (snap.heatFlow !== el.heatFlow) changed.push('heat-flow direction');
	if (canonical(snap.buildUp ?? null) !== canonical(el.buildUp ?? null)) changed.push('build-up');
	if (canonical(snap.internal ?? null) !== canonical(el.internal ?? null))
		changed.push('internal conditions');
	if (el.buildUp && (snap.climate?.id ?? null) !== (el.climateId ?? dwellingClimateId ?? null))
		changed.push('climate');
	if (different(snap.givenU ?? null, el.givenU) || (snap.givenU == null) !== (el.givenU == null))
		changed.push('given U-value');
	return changed;
}

/**
 * `stale-report`: an element whose inputs changed after its report was issued; the report no longer
 * describes it (common practice, no source).
 */
export function changedAfterIssue(ctx: ElementContext, dwellingClimateId: string | null): Flag[] {
	if (!ctx.report) return [];
	const changed = changesSinceIssue(ctx, dwellingClimateId);
	if (!changed.length) return [];
	return [
		elementFlag(
			ctx,
			'stale-report',
			'medium',
			`${ctx.at}: the ${changed.join(', ')} changed after report ${ctx.report.number} was issued; the report no longer describes the element.`
		)
	];
}

/** The elements the report records that are no longer in the dwelling, with what the report issued for them. */
export function removedSinceIssue(
	recorded: Iterable<SnapshotElement>,
	elements: readonly AuditElement[]
): RemovedElement[] {
	const current = new Set(elements.map((e) => e.id));
	return [...recorded]
		.filter((s) => !current.has(s.id))
		.map((s) => ({ id: s.id, name: s.name, kind: s.kind, issued: outcomeOf(s.result) }));
}

/**
 * `stale-report`: one flag for each element the report records that has since been removed from the
 * dwelling (common practice, no source).
 */
export function removedAfterIssue(removed: readonly RemovedElement[], report: AuditReport | null): Flag[] {
	return removed.map((r): Flag => ({
		code: 'stale-report',
		severity: 'medium',
		reason: `${r.name} (${kindLabel(r.kind)}) is in report ${report!.number} but has since been removed from the dwelling.`
	}));
}
