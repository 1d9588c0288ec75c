import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { requireMember } from '$lib/server/guard';
import { findNewerRevisions } from '$lib/server/library';
import { answer, parseWith, readJson } from '$lib/server/http';

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
export const POST = (event) =>
	answer(async () => {
		const member = requireMember(event);
		const { buildUp } = parseWith(bodySchema, await readJson(event.request));
		return json(await findNewerRevisions(member.organisationId, buildUp));
	});
