/** The rules of issued reports, in one place for the pages, the API and the server. */
import type { Role } from '$lib/members/roles';

/** Who may issue and e-mail reports; every member may read them. */
export const ISSUE_ROLES: readonly Role[] = ['assessor', 'admin'];

/**
 * A replaced revision stays readable and verifiable, but only the revision in force is sent to a client:
 * the refusal for e-mailing `report` when `newer` has replaced it, or null when it may be sent.
 */
export function supersededMailRefusal(
	report: { number: string; revision: number },
	newer: { revision: number } | null | undefined
): string | null {
	if (!newer) return null;
	return `Report ${report.number} revision ${report.revision} was replaced by revision ${newer.revision}; send revision ${newer.revision} instead.`;
}
