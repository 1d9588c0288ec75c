import { requireRole } from '$lib/server/guard';
import { deleteEvidence, EVIDENCE_WRITE_ROLES } from '$lib/server/evidence';
import { answer } from '$lib/server/http';

/** Delete evidence that no issued report lists yet (409 once one does), with its stored files. */
export const DELETE = (event) =>
	answer(async () => {
		const member = requireRole(event, ...EVIDENCE_WRITE_ROLES);
		await deleteEvidence(member, event.params.evidenceId);
		return new Response(null, { status: 204 });
	});
