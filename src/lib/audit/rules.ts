/** Who decides on an audited dwelling, in one place for the page, the API and the server. */
import type { Role } from '$lib/members/roles';

/** Roles that record decisions on audited dwellings. */
export const DECIDER_ROLES: readonly Role[] = ['supervisor', 'admin'];

/** Separation of duties, as the audit item page states it where the decision form would be. */
export const INDEPENDENCE_RULE =
	'Nobody decides on a dwelling they assessed or whose report they issued, whatever their role: another supervisor or admin decides on it.';

/** How people are tied to one dwelling: its assessor now, those named its assessor before, its issuers. */
export type Involvement = {
	assessorId: string | null;
	formerAssessorIds: readonly string[];
	/** every report of the dwelling (either scope, every revision) with the person who issued it */
	reports: readonly { number: string; revision: number; issuedBy: string }[];
};

/**
 * Whether `userId` may decide on an audit item of the dwelling: the refusal naming why they may not, or
 * null when they are independent of it.
 */
export function decisionRefusal(userId: string, involvement: Involvement): string | null {
	const why: string[] = [];
	if (involvement.assessorId === userId) why.push('you are its assessor');
	else if (involvement.formerAssessorIds.includes(userId)) why.push('you were its assessor');
	const issued = involvement.reports.filter((r) => r.issuedBy === userId);
	if (issued.length) {
		const r = issued[0];
		why.push(
			`you issued its report ${r.number} revision ${r.revision}${issued.length > 1 ? ` (and ${issued.length - 1} more)` : ''}`
		);
	}
	if (!why.length) return null;
	return `You cannot decide on this dwelling: ${why.join(' and ')}. ${INDEPENDENCE_RULE}`;
}

/** A running batch whose heartbeat is older than this is stalled: its worker stopped, another takes over. */
// Six missed heartbeats (HEARTBEAT_EVERY_MS is 5 s): a batch resumes well within a minute of a crash.
export const STALL_AFTER_MS = 30_000;

/**
 * True when a batch is running but its recompute has written no heartbeat for STALL_AFTER_MS: the worker
 * stopped (a crash, a restart), and "Recompute again" or the next worker takes it over.
 */
export function isStalled(
	progress: { state?: string; heartbeat?: string | null } | null | undefined,
	at = Date.now()
): boolean {
	if (progress?.state !== 'running') return false;
	const beat = Date.parse(progress.heartbeat ?? '');
	return !(beat >= at - STALL_AFTER_MS);
}
