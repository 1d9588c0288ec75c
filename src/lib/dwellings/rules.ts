/**
 * Whose a dwelling is, in one place for the pages, the API and the server: who may be named its assessor,
 * who may change that, and who issues its reports. The declaration printed in every report says "I
 * carried out the assessment … myself", so the person who issues must be the dwelling's assessor.
 */
import type { Role } from '$lib/members/roles';
import { ISSUE_ROLES } from '$lib/reports/rules';

/** The person acting: their user id and their role in the dwelling's organisation. */
export type Actor = { userId: string; role: Role };

/** Roles a dwelling's assessor holds: the members the form offers (supervisors review, never assess). */
export const ASSESSOR_ROLES: readonly Role[] = ['assessor', 'admin'];

/** Who may be named, and who may change it, as the page states it beside the assessor's field. */
export const ASSIGNMENT_RULE =
	'The assessor is an assessor or an admin of the organisation. An admin may name anyone of them; an assessor may hand a dwelling of theirs over to a colleague, or take on a dwelling that has no assessor. Every change of assessor is written to the activity log, with who it was before and after.';

/** Who issues, as the pages state it. */
export const ISSUE_RULE =
	'Only the dwelling’s assessor issues its reports: the declaration in each report is theirs, with their name and registration number. Anyone else, an admin included, becomes its assessor first.';

/**
 * Whether `actor` may change the assessor of a dwelling from `current` to `next` (user ids, null for
 * none): the refusal, or null when allowed. A new dwelling is its creator's to name, so this rule is for
 * dwellings that exist.
 */
export function reassignRefusal(actor: Actor, current: string | null, next: string | null): string | null {
	if (current === next) return null;
	if (actor.role === 'admin') return null;
	if (actor.role !== 'assessor') return 'Only an admin or the dwelling’s assessor changes who assesses it.';
	if (current === actor.userId) return null;
	if (current === null) {
		if (next === actor.userId) return null;
		return 'This dwelling has no assessor: you may take it on yourself, or an admin assigns it.';
	}
	return 'This dwelling is another assessor’s: only they (handing it over) or an admin can change its assessor.';
}

/**
 * Whether `actor` may issue a report of a dwelling whose assessor is `assessorId`: the refusal, or null
 * when allowed.
 */
export function issueRefusal(actor: Actor, assessorId: string | null): string | null {
	if (!ISSUE_ROLES.includes(actor.role)) return 'Only assessors and admins issue reports.';
	if (assessorId === null)
		return 'This dwelling has no assessor: name its assessor first, who then issues its reports.';
	if (assessorId !== actor.userId)
		return 'Only the dwelling’s assessor issues its reports, since the declaration in the report is theirs. To issue it yourself, become its assessor first (its assessor hands it over, or an admin reassigns it).';
	return null;
}
