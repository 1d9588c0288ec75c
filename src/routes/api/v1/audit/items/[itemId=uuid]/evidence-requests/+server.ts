import { json } from '@sveltejs/kit';
import { requireMember, requireRole } from '$lib/server/guard';
import { listRequestsForItem, requestEvidence } from '$lib/server/evidence';
import { DECIDER_ROLES } from '$lib/audit/rules';
import { answer, readJson } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

/** The evidence requests of an audit item, newest first. */
export const GET = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const items = await listRequestsForItem(member.organisationId, event.params.itemId);
		if (!items) throw new NotFoundError('No such audit item.');
		return json({ items });
	});

/** Ask for evidence on an audited dwelling: `{ note, dueDate }`. Supervisors and admins. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, ...DECIDER_ROLES);
		const request = await requestEvidence(member, event.params.itemId, await readJson(event.request));
		return json(request, { status: 201 });
	});
