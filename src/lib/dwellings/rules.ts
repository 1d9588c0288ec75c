/**
 * Whose a dwelling is, in one place for the pages, the API and the server: who may be named its assessor,
 * who may change that, and who issues its reports. The declaration printed in every report says "I
 * carried out the assessment … myself", so the person who issues must be the dwelling's assessor.
 */
import type { Role } from '$lib/members/roles';
import type { DwellingStatus } from './kinds';
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

/**
 * When a dwelling's record may change, as the pages state it: an accepted dwelling, or one a supervisor
 * is reviewing, is signed-off (or about to be) work, so it is reopened first with a reason, which is
 * logged and shown to the supervisor with every change made after it.
 */
export const REOPEN_RULE =
	'An accepted dwelling, or one awaiting review, is reopened with a reason before it changes. The reason, and every change made after it, is logged and shown to the supervisor; an accepted dwelling becomes “changed after acceptance” until it is reviewed again.';

/** Statuses in which a dwelling is reopened (with a reason) before it changes. */
export const REOPEN_STATUSES: readonly DwellingStatus[] = ['accepted', 'awaiting-review'];

/**
 * Why a dwelling in `status` may not change now (`reopened`: reopened during the current review), or
 * null when it may. `needsReason` says that reopening it with a reason lifts the refusal.
 */
export function changeRefusal(
	status: DwellingStatus,
	reopened: boolean
): { message: string; needsReason: boolean } | null {
	if (status === 'archived')
		return { message: 'This dwelling is archived; restore it before changing it.', needsReason: false };
	if (status === 'accepted')
		return {
			message:
				'This dwelling is accepted: reopen it with a reason before changing it (the reason and every change are logged and shown to the supervisor).',
			needsReason: true
		};
	if (status === 'awaiting-review' && !reopened)
		return {
			message:
				'This dwelling is awaiting review: reopen it with a reason before changing it (the supervisor sees the reason and every change).',
			needsReason: true
		};
	return null;
}

/** A refused reopening in a person's words: the reason's own message ("Say why …"), else the refusal. */
export function reopenRefusalText(
	message: string,
	issues: readonly { path: string; message: string }[]
): string {
	const reason = issues.find((i) => i.path === 'reason' || i.path === 'version');
	if (!reason) return message;
	const text =
		reason.path === 'version' ? 'the page is out of date: reload it and try again' : reason.message;
	return text.charAt(0).toUpperCase() + text.slice(1) + '.';
}
