import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember } from '$lib/server/guard';
import { findNewerRevisions } from '$lib/server/library';
import { fieldIssues } from '$lib/library/schema';
import { readJson } from '../respond';

const bodySchema = z.object({
	buildUp: z.looseObject(
		{
			layers: z.array(
				z.looseObject({ materialId: z.string().optional(), materialRevisionId: z.string().optional() }),
				{ error: 'must be a list of layers' }
			)
		},
		{ error: 'is required: { layers: [...] }' }
	)
});

/** Which layers of a build-up point at a material with a newer revision, and what would change. */
export const POST = async (event) => {
	const member = requireMember(event);
	const body = await readJson(event.request);
	if (!body.ok) return body.response;
	const parsed = bodySchema.safeParse(body.body);
	if (!parsed.success)
		return json({ message: 'The request is not right.', issues: fieldIssues(parsed.error) }, { status: 400 });
	return json(await findNewerRevisions(member.organisationId, parsed.data.buildUp));
};
