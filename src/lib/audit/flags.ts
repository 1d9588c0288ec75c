/** Flags the audit raises, each with a severity and a plain-language reason. */
export const FLAG_CODES = [
	'not-issued',
	'u-over-limit',
	'condensation-accumulates',
	'surface-mould-risk',
	'lambda-implausible',
	'material-unverified',
	'material-superseded',
	'framed-without-bridging',
	'thickness-implausible',
	'generic-lambda',
	'values-differ-from-revision',
	'not-reproducing',
	'library-changed',
	'stale-report',
	'recompute-failed',
	'input-implausible',
	'junction-changed',
	'junction-frsi-below-limit',
	'psi-entered',
	'psi-without-source'
] as const;
export type FlagCode = (typeof FLAG_CODES)[number];

export const FLAG_LABELS: Record<FlagCode, string> = {
	'not-issued': 'No issued report',
	'u-over-limit': 'U over the limit',
	'condensation-accumulates': 'Condensation does not dry out',
	'surface-mould-risk': 'Surface mould risk',
	'lambda-implausible': 'λ outside the plausible range',
	'material-unverified': 'Unverified material',
	'material-superseded': 'Superseded material revision',
	'framed-without-bridging': 'Framed construction without bridging',
	'thickness-implausible': 'Implausible thickness',
	'generic-lambda': 'Generic λ where a declared value is expected',
	'values-differ-from-revision': 'Layer values differ from the library revision',
	'not-reproducing': 'Issued numbers do not reproduce',
	'library-changed': 'Current library gives a different result',
	'stale-report': 'Inputs changed after issue',
	'recompute-failed': 'Could not be recomputed',
	'input-implausible': 'Unusual input (plausibility warning)',
	'junction-changed': 'Junction ψ or fRsi changed since issue',
	'junction-frsi-below-limit': 'Junction fRsi below its limit',
	'psi-entered': 'ψ entered, not calculated here',
	'psi-without-source': 'Entered ψ without a source'
};

export const SEVERITIES = ['high', 'medium', 'low'] as const;
export type Severity = (typeof SEVERITIES)[number];
export const SEVERITY_LABELS: Record<Severity, string> = { high: 'High', medium: 'Medium', low: 'Low' };
export const SEVERITY_RANK: Record<Severity, number> = { high: 0, medium: 1, low: 2 };

export type Flag = {
	code: FlagCode;
	severity: Severity;
	reason: string;
	elementId?: string;
	layerIndex?: number;
	/** the junction the flag is about */
	junctionId?: string;
};

export const DECISIONS = ['accepted', 'accepted-with-advice', 'returned'] as const;
export type Decision = (typeof DECISIONS)[number];
export const DECISION_LABELS: Record<Decision, string> = {
	accepted: 'Accepted',
	'accepted-with-advice': 'Accepted with advice',
	returned: 'Returned for correction'
};

/** Where an item stands, derived from its decision and the dwelling. */
export type ItemState = 'awaiting-review' | 'resubmitted' | Decision;
export const ITEM_STATE_LABELS: Record<ItemState, string> = {
	'awaiting-review': 'Awaiting review',
	resubmitted: 'Resubmitted',
	...DECISION_LABELS
};
