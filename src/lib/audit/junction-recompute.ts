/**
 * The recalculation of a dwelling's junctions in an audit, pure: each calculated junction computed again
 * from its stored choices and the dwelling's elements as they are now, with the dwelling's climate, the
 * way the junction pages and the reports compute it (runJunction). An identical request is calculated
 * once per cache: a junction solve is the costliest step of an audit.
 */
import { runJunction } from '$lib/junctions/run';
import type { JunctionCalculation } from '$lib/junctions/calculate';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { canonical } from './compare';
import type { AuditElement, AuditJunction, JunctionOutcome, SnapshotJunction } from './types';

/** Request (canonical JSON) → the figures it gives, or why it cannot be computed. */
export type JunctionCache = Map<string, JunctionOutcome | { error: string }>;

/** The figures of a junction's calculation that the audit compares and judges. */
export function junctionOutcomeOf(r: JunctionCalculation): JunctionOutcome {
	const s = r.surface;
	return {
		psi: r.psi,
		fRsi: s.fRsi,
		fRsiMin: s.critical?.fRsiMin ?? null,
		criticalMonth: s.critical?.month ?? null,
		surfacePass: s.critical ? s.critical.pass : null,
		ruleOfThumb: { value: s.ruleOfThumb.value, pass: s.ruleOfThumb.pass }
	};
}

/** What the report issued for a junction: its ψ and fRsi. */
export function issuedJunction(
	snap: SnapshotJunction | undefined
): { psi: number | null; fRsi: number | null } | null {
	if (!snap) return null;
	return { psi: snap.psi ?? null, fRsi: snap.fRsi ?? null };
}

/**
 * A calculated junction computed again with today's engine, or why it cannot be (field by field, as
 * the junction page would say). An entered ψ is not computed: null.
 */
export function recomputeJunction(
	j: AuditJunction,
	elements: readonly AuditElement[],
	months: ClimateMonthValues[] | null,
	cache: JunctionCache
): JunctionOutcome | { error: string } | null {
	if (j.source === 'entered') return null;
	if (!j.details) return { error: 'its builder choices are not recorded' };
	const request = {
		type: j.type,
		dimensionSystem: j.dimensionSystem,
		details: j.details,
		model: j.details.mode === 'free-form' ? j.model : undefined,
		elements: elements.map((e) => ({
			id: e.id,
			name: e.name,
			kind: e.kind,
			heatFlow: e.heatFlow,
			buildUp: e.buildUp,
			givenU: e.givenU
		})),
		months
	};
	// the element names do not change the figures, only the result's list of elements
	const key = canonical({ ...request, elements: request.elements.map((e) => ({ ...e, name: '' })) });
	const known = cache.get(key);
	if (known) return known;
	let outcome: JunctionOutcome | { error: string };
	try {
		const run = runJunction(request);
		outcome = run.ok
			? junctionOutcomeOf(run.result)
			: { error: run.issues.map((i) => `${i.path}: ${i.message}`).join('; ') };
	} catch (e) {
		outcome = { error: e instanceof Error ? e.message : String(e) };
	}
	cache.set(key, outcome);
	return outcome;
}
