/**
 * OpenAPI 3.1 path items for build-up templates, with JSON schemas generated from the same zod schemas
 * the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { templateInputSchema, templatePatchSchema } from '$lib/templates/schema';
import {
	common,
	conflict,
	fail,
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

const template = versioned(
	withMeta({
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
	})
);
const tags = ['Templates'];

export const paths: Record<string, unknown> = {
	'/api/v1/templates': {
		get: {
			tags,
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
				'400': fail('Unknown kind.'),
				...common
			}
		},
		post: {
			tags,
			summary: 'Save a build-up as a template (assessors and admins)',
			requestBody: jsonBody(templateInputSchema),
			responses: {
				'201': ok('The template.', template),
				...invalid(),
				...common,
				...conflict('Name taken.')
			}
		}
	},
	'/api/v1/templates/{templateId}': {
		parameters: [idParam('templateId')],
		get: readOne(tags, 'One template', 'The template.', template),
		patch: {
			tags,
			summary: 'Change a template (its author or an admin); send the version you loaded',
			requestBody: jsonBody(templatePatchSchema),
			responses: {
				'200': ok('The template.', template),
				...invalid(),
				...common,
				...notFound(),
				...conflict(
					'Name taken, or a stale version (changed by someone else since you loaded it).',
					currentVersion
				)
			}
		},
		put: {
			tags,
			summary: 'Same as PATCH',
			requestBody: jsonBody(templatePatchSchema),
			responses: {
				'200': ok('The template.', template),
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
			'Delete a template (its author or an admin)',
			'A stale version (changed by someone else since you loaded it).'
		)
	}
};
