/** The requests of the reach of a library correction, validated with zod (the API and the OpenAPI document). */
import { z } from 'zod';
import { pageQuery } from '$lib/validation';

/** The most elements one move may name. */
export const MOVE_MAX = 20_000;

/** The reach's query: a page of its dwellings. */
export const reachQuerySchema = z.object({
	...pageQuery(100, 1000)
});

const uuid = z.uuid({ error: 'must be an element id' });
export const moveRequestSchema = z.object({
	elementIds: z
		.array(uuid, { error: 'is required: the ids of the elements to move' })
		.min(1, 'name at least one element')
		.max(MOVE_MAX, `must name at most ${MOVE_MAX.toLocaleString('en-GB')} elements`),
	toRevisionId: z.uuid({ error: 'is required: the id of the revision to move to (the current one)' })
});
export type MoveRequest = z.output<typeof moveRequestSchema>;
