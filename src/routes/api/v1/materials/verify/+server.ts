import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { verifyMaterials } from '$lib/server/library';
import { answer, parseWith, readJson } from '$lib/server/http';

const bulkVerifySchema = z.object({
	revisionIds: z
		.array(z.uuid({ error: 'must be revision ids' }), { error: 'must be a list of revision ids' })
		.min(1, 'choose at least one revision')
		.max(200, 'at most 200 revisions at once')
});

/**
 * Verify several current revisions at once (supervisors and admins). Body: { revisionIds }. Answers
 * { verified, skipped }: a revision that may not be verified (not current, not unverified, written by
 * the caller) is left as it was and listed with the reason.
 */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, 'supervisor', 'admin');
		const input = parseWith(bulkVerifySchema, await readJson(event.request));
		return json(
			await verifyMaterials(
				{ userId: member.user.id, organisationId: member.organisationId },
				input.revisionIds
			)
		);
	}, event.request);
