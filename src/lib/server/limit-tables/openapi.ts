/**
 * OpenAPI 3.1 path items for limit tables, with JSON schemas generated from the same zod schemas the
 * endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { limitTableInputSchema, limitTableUpdateSchema } from '$lib/limit-tables/schema';
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
	withMeta,
	currentVersion,
	versioned,
	readOne,
	deleteVersioned
} from '$lib/server/openapi-kit';

const limitTable = versioned(withMeta(schema(limitTableInputSchema, 'output')));
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
		get: readOne(tags, 'One limit table', 'The table.', limitTable),
		put: {
			tags,
			summary:
				'Replace a limit table (admins); isDefault: true makes it the default; send the version you loaded',
			description:
				'A stale `version` (somebody saved in between) is answered 409 with `currentVersion`. Changing the limits of a table that dwellings are judged against (or of the default) needs `confirm: true`; without it the answer is 409 with `needsConfirm`, the number of dwellings and the changed limits, and nothing is saved.',
			requestBody: jsonBody({
				allOf: [
					schema(limitTableUpdateSchema),
					{ type: 'object', properties: { confirm: { type: 'boolean' } } }
				]
			}),
			responses: {
				'200': ok('The table.', limitTable),
				...invalid(),
				...common,
				...notFound(),
				...conflict(
					'Name taken, a stale version (currentVersion), or new limits for a table in use not confirmed (needsConfirm).',
					{
						...currentVersion,
						needsConfirm: { type: 'boolean' },
						dwellings: { type: 'integer', description: 'dwellings judged against the table' },
						changes: {
							type: 'array',
							items: {
								type: 'object',
								properties: {
									kind: { type: 'string' },
									from: { type: ['number', 'null'] },
									to: { type: ['number', 'null'] }
								}
							}
						}
					}
				)
			}
		},
		delete: deleteVersioned(
			tags,
			'Delete a limit table (admins)',
			'A dwelling uses it, it is the default, or a stale version.'
		)
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
