/**
 * The audit's flags by kind, so a supervisor can look at one kind at a time: what fails its limit, what
 * the issued report does not show any more, what comes from the library, and inputs to look at again.
 * The grouping is Envelo's own; every code belongs to exactly one group.
 */
import type { Flag, FlagCode } from './flags';
import { FLAG_CODES, SEVERITY_RANK } from './flags';

export const FLAG_GROUPS = ['limits', 'record', 'library', 'inputs'] as const;
export type FlagGroup = (typeof FLAG_GROUPS)[number];

export const FLAG_GROUP_LABELS: Record<FlagGroup, string> = {
	limits: 'Against the limits',
	record: 'Issued record and recompute',
	library: 'Materials and library',
	inputs: 'Inputs to check'
};

export const FLAG_GROUP_OF: Record<FlagCode, FlagGroup> = {
	'u-over-limit': 'limits',
	'condensation-accumulates': 'limits',
	'surface-mould-risk': 'limits',
	'junction-frsi-below-limit': 'limits',
	'not-issued': 'record',
	'not-reproducing': 'record',
	'library-changed': 'record',
	'stale-report': 'record',
	'recompute-failed': 'record',
	'junction-changed': 'record',
	'lambda-implausible': 'library',
	'material-unverified': 'library',
	'material-superseded': 'library',
	'generic-lambda': 'library',
	'values-differ-from-revision': 'library',
	'framed-without-bridging': 'inputs',
	'thickness-implausible': 'inputs',
	'input-implausible': 'inputs',
	'psi-entered': 'inputs',
	'psi-without-source': 'inputs'
};

/** The group of a code; a code this build does not know (an older stored flag) counts as an input to check. */
export const groupOf = (code: string): FlagGroup =>
	(FLAG_GROUP_OF as Record<string, FlagGroup | undefined>)[code] ?? 'inputs';

/** The codes of a group, in the order of FLAG_CODES. */
export const codesOf = (group: FlagGroup): FlagCode[] => FLAG_CODES.filter((c) => FLAG_GROUP_OF[c] === group);

export type FlagFilter = { group?: FlagGroup | ''; code?: string; severity?: Flag['severity'] | '' };

/** True when a flag passes the filter (an empty filter passes every flag). */
export function matchesFlag(f: Pick<Flag, 'code' | 'severity'>, filter: FlagFilter): boolean {
	if (filter.code && f.code !== filter.code) return false;
	if (filter.group && groupOf(f.code) !== filter.group) return false;
	if (filter.severity && f.severity !== filter.severity) return false;
	return true;
}

/**
 * The flags that pass the filter, in the groups' order, each group's flags most severe first (then in
 * the order they came); groups left empty are left out.
 */
export function groupFlags<F extends Pick<Flag, 'code' | 'severity'>>(
	flags: readonly F[],
	filter: FlagFilter = {}
): { group: FlagGroup; label: string; flags: F[] }[] {
	return FLAG_GROUPS.map((group) => ({
		group,
		label: FLAG_GROUP_LABELS[group],
		flags: flags
			.map((f, i) => ({ f, i }))
			.filter(({ f }) => groupOf(f.code) === group && matchesFlag(f, filter))
			.sort((a, b) => SEVERITY_RANK[a.f.severity] - SEVERITY_RANK[b.f.severity] || a.i - b.i)
			.map(({ f }) => f)
	})).filter((g) => g.flags.length > 0);
}

/** How many flags of each group, for the filter's choices. */
export function countByGroup(flags: readonly Pick<Flag, 'code'>[]): Record<FlagGroup, number> {
	const out = Object.fromEntries(FLAG_GROUPS.map((g) => [g, 0])) as Record<FlagGroup, number>;
	for (const f of flags) out[groupOf(f.code)]++;
	return out;
}
