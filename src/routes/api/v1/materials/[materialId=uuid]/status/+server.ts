import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { getCurrentRevision, setMaterialStatus } from '$lib/server/library';
import { answer, parseWith, readJson } from '$lib/server/http';
import { NotFoundError } from '$lib/server/errors';

const bodySchema = z.object({
	action: z.enum(['verify', 'supersede'], { error: 'must be verify or supersede' }),
	expectedRevisionId: z.uuid({ error: 'must be a revision id' }).optional()
});

/** Verify or supersede the current revision (supervisors and admins). Body: { action, expectedRevisionId? }. */
export const POST = (event) =>
	answer(async () => {
		const member = requireRole(event, 'supervisor', 'admin');
		if (!(await getCurrentRevision(member.organisationId, event.params.materialId))) {
			throw new NotFoundError('No such material.');
		}
		const input = parseWith(bodySchema, await readJson(event.request));
		return json(
			await setMaterialStatus(
				{ userId: member.user.id, organisationId: member.organisationId },
				event.params.materialId,
				input.action,
				input.expectedRevisionId
			)
		);
	});
