/**
 * OpenAPI 3.1 path items for climates, with JSON schemas generated from the same zod schemas the
 * endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { climateInputSchema, climateUpdateSchema } from '$lib/climates/schema';
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

const climate = versioned(withMeta(schema(climateInputSchema, 'output')));
const tags = ['Climates'];

export const paths: Record<string, unknown> = {
	'/api/v1/climates': {
		get: {
			tags,
			summary: "The organisation's climates",
			responses: { '200': ok('Climates, each with its usage.', list(climate)), ...common }
		},
		post: {
			tags,
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
				...invalid('Invalid input: one issue per field, or per line of the CSV.'),
				...common,
				...conflict('A climate of that name exists.')
			}
		}
	},
	'/api/v1/climates/{climateId}': {
		parameters: [idParam('climateId')],
		get: readOne(tags, 'One climate', 'The climate.', climate),
		put: {
			tags,
			summary: 'Replace a climate (admins); send the version you loaded',
			requestBody: jsonBody(climateUpdateSchema),
			responses: {
				'200': ok('The climate.', climate),
				...invalid(),
				...common,
				...notFound(),
				...conflict(
					'Name taken, or a stale version (changed by someone else since you loaded it).',
					currentVersion
				)
			}
		},
		delete: deleteVersioned(
			tags,
			'Delete a climate (admins)',
			'A dwelling or element uses it, or a stale version.'
		)
	}
};
