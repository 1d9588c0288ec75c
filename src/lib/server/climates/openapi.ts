/**
 * OpenAPI 3.1 path items for climates, limit tables and templates, with JSON schemas generated from the
 * same zod schemas the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { z } from 'zod';
import { climateInputSchema } from '$lib/climates/schema';
import { limitTableInputSchema } from '$lib/limit-tables/schema';
import { templateInputSchema, templatePatchSchema } from '$lib/templates/schema';

const schema = (s: z.ZodType, io: 'input' | 'output' = 'input') =>
	z.toJSONSchema(s, { io, unrepresentable: 'any' }) as Record<string, unknown>;

const stamps = {
	createdAt: { type: 'string', format: 'date-time' },
	updatedAt: { type: 'string', format: 'date-time' }
};
const idProp = { id: { type: 'string', format: 'uuid' } };
const problem = {
	type: 'object',
	properties: {
		message: { type: 'string' },
		issues: {
			type: 'array',
			items: {
				type: 'object',
				properties: { path: { type: 'string' }, message: { type: 'string' }, line: { type: 'integer' } },
				required: ['path', 'message']
			}
		}
	},
	required: ['message']
};
const messageOnly = { type: 'object', properties: { message: { type: 'string' } }, required: ['message'] };
const jsonBody = (s: Record<string, unknown>) => ({
	required: true,
	content: { 'application/json': { schema: s } }
});
const ok = (description: string, s: Record<string, unknown>) => ({
	description,
	content: { 'application/json': { schema: s } }
});
const list = (item: Record<string, unknown>) => ({
	type: 'object',
	properties: { items: { type: 'array', items: item } },
	required: ['items']
});
const withMeta = (s: Record<string, unknown>) => ({
	allOf: [s, { type: 'object', properties: { ...idProp, ...stamps }, required: ['id'] }]
});

const climate = withMeta(schema(climateInputSchema, 'output'));
const limitTable = withMeta(schema(limitTableInputSchema, 'output'));
const template = withMeta({
	allOf: [
		schema(templateInputSchema, 'output'),
		{
			type: 'object',
			properties: {
				createdBy: {
					type: ['object', 'null'],
					properties: { id: { type: 'string' }, name: { type: ['string', 'null'] } }
				}
			}
		}
	]
});

const common = {
	'401': ok('Not signed in.', messageOnly),
	'403': ok('The role does not allow this.', messageOnly)
};
const notFound = { '404': ok('No such record in your organisation.', messageOnly) };
const invalid = { '400': ok('Invalid input: one issue per field.', problem) };
const conflict = (why: string) => ({ '409': ok(why, messageOnly) });
const idParam = (name: string) => [
	{ name, in: 'path', required: true, schema: { type: 'string', format: 'uuid' } }
];

export const paths: Record<string, unknown> = {
	'/api/v1/climates': {
		get: {
			tags: ['Climates'],
			summary: "The organisation's climates",
			responses: { '200': ok('Climates, each with its usage.', list(climate)), ...common }
		},
		post: {
			tags: ['Climates'],
			summary: 'Create a climate (admins)',
			description:
				'JSON with `months` (12 × { month, temperature °C, relativeHumidity % }), or JSON with `csv` (the text of a CSV file with a header naming month, temperature, relative_humidity and 12 rows) instead of `months`, or a `text/csv` body with `?name=&source=&illustrative=`. CSV problems are reported one per line.',
			requestBody: {
				required: true,
				content: {
					'application/json': {
						schema: {
							oneOf: [
								schema(climateInputSchema),
								{
									type: 'object',
									properties: {
										name: { type: 'string' },
										source: { type: 'string' },
										illustrative: { type: 'boolean' },
										csv: { type: 'string' }
									},
									required: ['name', 'source', 'csv']
								}
							]
						}
					},
					'text/csv': { schema: { type: 'string' } }
				}
			},
			responses: {
				'201': ok('The climate.', climate),
				...invalid,
				...common,
				...conflict('A climate of that name exists.')
			}
		}
	},
	'/api/v1/climates/{climateId}': {
		parameters: idParam('climateId'),
		get: {
			tags: ['Climates'],
			summary: 'One climate',
			responses: { '200': ok('The climate.', climate), ...common, ...notFound }
		},
		put: {
			tags: ['Climates'],
			summary: 'Replace a climate (admins)',
			requestBody: jsonBody(schema(climateInputSchema)),
			responses: {
				'200': ok('The climate.', climate),
				...invalid,
				...common,
				...notFound,
				...conflict('Name taken.')
			}
		},
		delete: {
			tags: ['Climates'],
			summary: 'Delete a climate (admins)',
			responses: {
				'204': { description: 'Deleted.' },
				...common,
				...notFound,
				...conflict('A dwelling or element uses it.')
			}
		}
	},
	'/api/v1/limit-tables': {
		get: {
			tags: ['Limit tables'],
			summary: "The organisation's limit tables, the default first",
			responses: { '200': ok('Limit tables.', list(limitTable)), ...common }
		},
		post: {
			tags: ['Limit tables'],
			summary: 'Create a limit table (admins); the first one becomes the default',
			requestBody: jsonBody(schema(limitTableInputSchema)),
			responses: {
				'201': ok('The table.', limitTable),
				...invalid,
				...common,
				...conflict('A table of that name and edition exists.')
			}
		}
	},
	'/api/v1/limit-tables/{limitTableId}': {
		parameters: idParam('limitTableId'),
		get: {
			tags: ['Limit tables'],
			summary: 'One limit table',
			responses: { '200': ok('The table.', limitTable), ...common, ...notFound }
		},
		put: {
			tags: ['Limit tables'],
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
				...invalid,
				...common,
				...notFound,
				...conflict('Name taken, or new limits for a table in use not confirmed (needsConfirm).')
			}
		},
		delete: {
			tags: ['Limit tables'],
			summary: 'Delete a limit table (admins)',
			responses: {
				'204': { description: 'Deleted.' },
				...common,
				...notFound,
				...conflict('A dwelling uses it, or it is the default.')
			}
		}
	},
	'/api/v1/limit-tables/{limitTableId}/default': {
		parameters: idParam('limitTableId'),
		post: {
			tags: ['Limit tables'],
			summary: "Make the table the organisation's default (admins)",
			responses: { '200': ok('The table.', limitTable), ...common, ...notFound }
		}
	},
	'/api/v1/templates': {
		get: {
			tags: ['Templates'],
			summary: "The organisation's templates",
			parameters: [
				{
					name: 'kind',
					in: 'query',
					schema: { type: 'string' },
					description: 'Only templates of this element kind.'
				},
				{
					name: 'q',
					in: 'query',
					schema: { type: 'string' },
					description: 'Text in the name or description.'
				}
			],
			responses: {
				'200': ok('Templates.', list(template)),
				'400': ok('Unknown kind.', messageOnly),
				...common
			}
		},
		post: {
			tags: ['Templates'],
			summary: 'Save a build-up as a template (assessors and admins)',
			requestBody: jsonBody(schema(templateInputSchema)),
			responses: { '201': ok('The template.', template), ...invalid, ...common, ...conflict('Name taken.') }
		}
	},
	'/api/v1/templates/{templateId}': {
		parameters: idParam('templateId'),
		get: {
			tags: ['Templates'],
			summary: 'One template',
			responses: { '200': ok('The template.', template), ...common, ...notFound }
		},
		patch: {
			tags: ['Templates'],
			summary: 'Change a template (its author or an admin)',
			requestBody: jsonBody(schema(templatePatchSchema)),
			responses: {
				'200': ok('The template.', template),
				...invalid,
				...common,
				...notFound,
				...conflict('Name taken.')
			}
		},
		put: {
			tags: ['Templates'],
			summary: 'Same as PATCH',
			requestBody: jsonBody(schema(templatePatchSchema)),
			responses: { '200': ok('The template.', template), ...invalid, ...common, ...notFound }
		},
		delete: {
			tags: ['Templates'],
			summary: 'Delete a template (its author or an admin)',
			responses: { '204': { description: 'Deleted.' }, ...common, ...notFound }
		}
	}
};
