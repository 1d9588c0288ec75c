import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireRole } from '$lib/server/guard';
import { getCurrentRevision, setMaterialStatus } from '$lib/server/library';
import { fieldIssues } from '$lib/library/schema';
import { failure, readJson } from '../../respond';

const bodySchema = z.object({
	action: z.enum(['verify', 'supersede'], { error: 'must be verify or supersede' }),
	expectedRevisionId: z.uuid({ error: 'must be a revision id' }).optional()
});

/** Verify or supersede the current revision (supervisors and admins). Body: { action, expectedRevisionId? }. */
export const POST = async (event) => {
	const member = requireRole(event, 'supervisor', 'admin');
	if (!(await getCurrentRevision(member.organisationId, event.params.materialId))) {
		return json({ message: 'No such material.' }, { status: 404 });
	}
	const body = await readJson(event.request);
	if (!body.ok) return body.response;
	const parsed = bodySchema.safeParse(body.body);
	if (!parsed.success)
		return json({ message: 'The request is not right.', issues: fieldIssues(parsed.error) }, { status: 400 });
	try {
		return json(
			await setMaterialStatus(
				{ userId: member.user.id, organisationId: member.organisationId },
				event.params.materialId,
				parsed.data.action,
				parsed.data.expectedRevisionId
			)
		);
	} catch (e) {
		return failure(e);
	}
};
