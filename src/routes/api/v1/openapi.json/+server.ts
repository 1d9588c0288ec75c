import { json } from '@sveltejs/kit';
import { requireMember } from '$lib/server/guard';
import { openApiDocument } from '$lib/server/openapi';

/** The OpenAPI document, generated from the same zod schemas the endpoints validate with. */
export const GET = (event) => {
	requireMember(event);
	return json(openApiDocument());
};
