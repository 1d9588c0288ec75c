/**
 * Checks of the dwelling's junctions: does the issued report still describe them, do their ψ and fRsi
 * come out as issued when computed again, does each fRsi reach its limit, and does an entered ψ name a
 * source. The audit's rules are common practice, no source, unless a message names one.
 */
import { JUNCTION_TYPE_LABELS, DIMENSION_SYSTEM_LABELS } from '$lib/junctions/kinds';
import { canonical, different } from '$lib/audit/compare';
import type { Flag, FlagCode, Severity } from '$lib/audit/flags';
import type {
	AuditJunction,
	AuditReport,
	JunctionOutcome,
	RemovedJunction,
	SnapshotJunction
} from '$lib/audit/types';
import { monthName } from '$lib/format';

/** |Δψ| beyond which a recomputed ψ counts as changed, W/(m·K). */
export const PSI_TOLERANCE = 0.0005; // common practice, no source: half a unit in the third decimal, as printed
/** |ΔfRsi| beyond which a recomputed fRsi counts as changed. */
export const FRSI_TOLERANCE = 0.0005; // common practice, no source: half a unit in the third decimal, as printed

/** One junction of the dwelling, with its record in the issued report. */
export type JunctionContext = {
	junction: AuditJunction;
	/** the junction as the latest issued report recorded it; undefined when it is not in the report */
	snapshot: SnapshotJunction | undefined;
	report: AuditReport | null;
	/** whether the report records junctions at all (reports issued before junctions were reported do not) */
	recorded: boolean;
	/** how messages name the junction: `Junction "Corners" (External corner (walls))` */
	at: string;
};

export const junctionAt = (j: { name: string; type: string }) =>
	`Junction "${j.name}" (${JUNCTION_TYPE_LABELS[j.type as keyof typeof JUNCTION_TYPE_LABELS] ?? j.type})`;

export function junctionContext(
	junction: AuditJunction,
	snapshot: SnapshotJunction | undefined,
	report: AuditReport | null
): JunctionContext {
	return {
		junction,
		snapshot,
		report,
		recorded: Array.isArray(report?.snapshot.junctions),
		at: junctionAt(junction)
	};
}

/** A flag on a junction. */
export function junctionFlag(ctx: JunctionContext, code: FlagCode, severity: Severity, reason: string): Flag {
	return { code, severity, junctionId: ctx.junction.id, reason };
}

const f3 = (v: number | null | undefined) => (v === null || v === undefined ? '—' : v.toFixed(3));
const signed = (v: number) => `${v > 0 ? '+' : ''}${v.toFixed(3)}`;

/**
 * `stale-report` (medium): a junction that is not in the latest issued report: added since, or the
 * report was issued before junctions were reported.
 */
export function junctionAddedAfterIssue(ctx: JunctionContext): Flag[] {
	if (!ctx.report || ctx.snapshot) return [];
	return [
		junctionFlag(
			ctx,
			'stale-report',
			'medium',
			ctx.recorded
				? `${ctx.at} was added after report ${ctx.report.number} was issued.`
				: `${ctx.at} is not in report ${ctx.report.number}, which was issued before junctions were reported; its heat loss leaves the junction out.`
		)
	];
}

/**
 * What of a junction's inputs changed since the report recorded it, in words: type, length, dimension
 * system, where ψ comes from, the source named for an entered ψ, and the build (the builder's choices,
 * or the free-form model). A change of ψ itself is `junction-changed`'s.
 */
export function junctionChangesSinceIssue(ctx: JunctionContext): string[] {
	const j = ctx.junction;
	const s = ctx.snapshot;
	if (!s) return [];
	const changed: string[] = [];
	if (s.type !== j.type) changed.push('type');
	if (different(s.lengthM, j.lengthM)) changed.push('length');
	if (s.dimensionSystem !== j.dimensionSystem) changed.push('dimension system');
	if (s.source !== j.source) changed.push('source of ψ (calculated or entered)');
	else if (j.source === 'entered' && (s.psiSource ?? '').trim() !== (j.psiSource ?? '').trim())
		changed.push('source named for the entered ψ');
	if (j.source === 'calculated' && s.source === 'calculated') {
		const freeForm = j.details?.mode === 'free-form';
		if (canonical(s.details ?? null) !== canonical(j.details ?? null)) changed.push('build');
		else if (freeForm && s.model !== undefined && canonical(s.model ?? null) !== canonical(j.model ?? null))
			changed.push('model');
	}
	return changed;
}

/** `stale-report` (medium): a junction whose inputs changed after the report was issued. */
export function junctionChangedAfterIssue(ctx: JunctionContext): Flag[] {
	if (!ctx.report) return [];
	const changed = junctionChangesSinceIssue(ctx);
	if (!changed.length) return [];
	return [
		junctionFlag(
			ctx,
			'stale-report',
			'medium',
			`${ctx.at}: the ${changed.join(', ')} changed after report ${ctx.report.number} was issued; the report no longer describes the junction.`
		)
	];
}

/** The junctions the report records that are no longer in the dwelling, with what it issued for them. */
export function junctionsRemovedSinceIssue(
	recorded: readonly SnapshotJunction[],
	junctions: readonly AuditJunction[]
): RemovedJunction[] {
	const current = new Set(junctions.map((j) => j.id));
	return recorded
		.filter((s) => !current.has(s.id))
		.map((s) => ({
			id: s.id,
			name: s.name,
			type: s.type,
			issued: { psi: s.psi ?? null, fRsi: s.fRsi ?? null }
		}));
}

/** `stale-report` (medium): one flag for each junction of the report removed from the dwelling since. */
export function junctionRemovedAfterIssue(
	removed: readonly RemovedJunction[],
	report: AuditReport | null
): Flag[] {
	return removed.map((r): Flag => ({
		code: 'stale-report',
		severity: 'medium',
		junctionId: r.id,
		reason: `${junctionAt(r)} is in report ${report!.number} but has since been removed from the dwelling.`
	}));
}

/** `recompute-failed` (high): a calculated junction that today's engine cannot build or compute. */
export function junctionRecomputeFailed(ctx: JunctionContext, error: string | undefined): Flag[] {
	if (error === undefined) return [];
	return [junctionFlag(ctx, 'recompute-failed', 'high', `${ctx.at} could not be recomputed: ${error}.`)];
}

/**
 * `junction-changed` (medium): the ψ or the fRsi of a junction differs from the issued one by more than
 * PSI_TOLERANCE or FRSI_TOLERANCE: computed again from its choices and the dwelling's elements as they
 * are now (a changed build-up, a changed climate, a new engine), or, entered, as entered now.
 */
export function junctionChanged(
	ctx: JunctionContext,
	issued: { psi: number | null; fRsi: number | null } | null,
	current: JunctionOutcome | null
): Flag[] {
	if (!ctx.report || !issued || !current) return [];
	const dPsi = issued.psi !== null && current.psi !== null ? current.psi - issued.psi : null;
	const dF = issued.fRsi !== null && current.fRsi !== null ? current.fRsi - issued.fRsi : null;
	const psiMoved =
		dPsi !== null ? Math.abs(dPsi) > PSI_TOLERANCE : (issued.psi === null) !== (current.psi === null);
	const fMoved = dF !== null && Math.abs(dF) > FRSI_TOLERANCE;
	if (!psiMoved && !fMoved) return [];
	const entered = ctx.junction.source === 'entered';
	const psi = (v: number | null) => `ψ = ${f3(v)} W/(m·K)`;
	const was = entered ? psi(issued.psi) : `${psi(issued.psi)} and fRsi = ${f3(issued.fRsi)}`;
	const now = entered
		? `as entered now, ${psi(current.psi)}`
		: `computed today from its choices and the dwelling's elements, ${psi(current.psi)} and fRsi = ${f3(current.fRsi)}`;
	const moves = [
		psiMoved && dPsi !== null ? `ψ ${signed(dPsi)} W/(m·K)` : null,
		fMoved && dF !== null ? `fRsi ${signed(dF)}` : null
	].filter(Boolean);
	return [
		junctionFlag(
			ctx,
			'junction-changed',
			'medium',
			`${ctx.at}, ψ on ${DIMENSION_SYSTEM_LABELS[ctx.junction.dimensionSystem]}: report ${ctx.report.number} gives ${was}; ${now}${moves.length ? ` (${moves.join(', ')})` : ''}.`
		)
	];
}

/**
 * `junction-frsi-below-limit`: the junction's fRsi below the critical month's fRsi,min of the dwelling's
 * climate (80 % surface humidity, ISO 13788 as the engine computes it; high); without a climate, below
 * the 0.75 commonly used for dwellings (common practice, no source; medium).
 */
export function junctionFRsiBelowLimit(ctx: JunctionContext, current: JunctionOutcome | null): Flag[] {
	if (!current || current.fRsi === null) return [];
	if (current.surfacePass === false)
		return [
			junctionFlag(
				ctx,
				'junction-frsi-below-limit',
				'high',
				`${ctx.at}: fRsi = ${f3(current.fRsi)} is below the fRsi,min = ${f3(current.fRsiMin)} of ${monthName(current.criticalMonth)} in the dwelling's climate (ISO 13788): risk of mould growth at the junction.`
			)
		];
	if (current.surfacePass === null && current.ruleOfThumb && !current.ruleOfThumb.pass)
		return [
			junctionFlag(
				ctx,
				'junction-frsi-below-limit',
				'medium',
				`${ctx.at}: fRsi = ${f3(current.fRsi)} is below the ${current.ruleOfThumb.value.toFixed(2)} commonly used for dwellings (common practice, no source); the dwelling has no climate to judge it by month.`
			)
		];
	return [];
}

/** `psi-entered` (low): a ψ taken from another source, which the audit cannot recompute. */
export function psiEntered(ctx: JunctionContext): Flag[] {
	const j = ctx.junction;
	if (j.source !== 'entered') return [];
	const source = j.psiSource?.trim();
	return [
		junctionFlag(
			ctx,
			'psi-entered',
			'low',
			`${ctx.at}: ψ = ${f3(j.psiEntered)} W/(m·K) is entered${source ? ` from “${source}”` : ''}, not calculated here: check it against its source.`
		)
	];
}

/**
 * Names that say no source (common practice, no source): blanks, dashes, question marks, "n/a",
 * "none", "unknown", "tbc"/"tbd", "default", "estimate(d)", "assumed" on their own.
 */
const NO_SOURCE =
	/^(?:[-–—.?x\s]*|n\s*\/?\s*a|none|nil|unknown|not known|tbc|tbd|to follow|default|estimated?|assumed|guess(?:ed)?)$/i;

/** `psi-without-source` (high): an entered ψ whose source is missing or names none. */
export function psiWithoutSource(ctx: JunctionContext): Flag[] {
	const j = ctx.junction;
	if (j.source !== 'entered') return [];
	const source = (j.psiSource ?? '').trim();
	if (source.length >= 3 && !NO_SOURCE.test(source)) return [];
	return [
		junctionFlag(
			ctx,
			'psi-without-source',
			'high',
			`${ctx.at}: the entered ψ = ${f3(j.psiEntered)} W/(m·K) ${source ? `names “${source}”, which is no source` : 'names no source'}: a ψ not calculated here must say where it comes from (a document, a table, a calculation).`
		)
	];
}
