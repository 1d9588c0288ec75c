/**
 * OpenAPI 3.1 path items for limit tables, with JSON schemas generated from the same zod schemas the
 * endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import {
	common,
	conflict,
	idParam,
	invalid,
	jsonBody,
	list,
	notFound,
	ok,
	schema,
	withMeta
} from '$lib/server/openapi-kit';

const limitTable = withMeta(schema(limitTableInputSchema, 'output'));
const tags = ['Limit tables'];

export const paths: Record<string, unknown> = {
	'/api/v1/limit-tables': {
		get: {
			tags,
			summary: "The organisation's limit tables, the default first",
			responses: { '200': ok('Limit tables.', list(limitTable)), ...common }
		},
		post: {
			tags,
			summary: 'Create a limit table (admins); the first one becomes the default',
			requestBody: jsonBody(limitTableInputSchema),
			responses: {
				'201': ok('The table.', limitTable),
				...invalid(),
				...common,
				...conflict('A table of that name and edition exists.')
			}
		}
	},
	'/api/v1/limit-tables/{limitTableId}': {
		parameters: [idParam('limitTableId')],
		get: {
			tags,
			summary: 'One limit table',
			responses: { '200': ok('The table.', limitTable), ...common, ...notFound() }
		},
		put: {
			tags,
			summary: 'Replace a limit table (admins); isDefault: true makes it the default',
			description:
				'Changing the limits of a table that dwellings are judged against (or of the default) needs `confirm: true`; without it the answer is 409 with `needsConfirm`, the number of dwellings and the changed limits, and nothing is saved.',
			requestBody: jsonBody({
				allOf: [
					schema(limitTableInputSchema),
					{ type: 'object', properties: { confirm: { type: 'boolean' } } }
				]
			}),
			responses: {
				'200': ok('The table.', limitTable),
				...invalid(),
				...common,
				...notFound(),
				...conflict('Name taken, or new limits for a table in use not confirmed (needsConfirm).')
			}
		},
		delete: {
			tags,
			summary: 'Delete a limit table (admins)',
			responses: {
				'204': ok('Deleted.'),
				...common,
				...notFound(),
				...conflict('A dwelling uses it, or it is the default.')
			}
		}
	},
	'/api/v1/limit-tables/{limitTableId}/default': {
		parameters: [idParam('limitTableId')],
		post: {
			tags,
			summary: "Make the table the organisation's default (admins)",
			responses: { '200': ok('The table.', limitTable), ...common, ...notFound() }
		}
	}
};
