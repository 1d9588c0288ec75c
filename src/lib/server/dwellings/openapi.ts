/** OpenAPI path items of dwellings, elements and the stateless calculation, from the same zod schemas the API validates with. */
import { elementInputSchema, elementResultSchema } from '$lib/physics';
import { elementOrderSchema } from '$lib/server/dwellings/elements';
import {
	archiveSchema,
	dwellingCopySchema,
	dwellingFieldsSchema,
	dwellingListQuerySchema,
	dwellingUpdateSchema,
	elementFieldsSchema,
	reopenSchema,
	elementUpdateSchema,
	thicknessRequestSchema
} from '$lib/dwellings/schema';
import {
	common,
	conflict,
	idParam,
	invalid,
	jsonBody,
	notFound,
	ok,
	queryParams,
	schema
} from '$lib/server/openapi-kit';

const errors = {
	...invalid('Invalid input: each issue names the field (dotted path) and why'),
	...common,
	...notFound('Not found in your organisation')
};
const stale = conflict('Stale version: changed by someone else since you loaded it', {
	currentVersion: { type: 'integer', description: 'the version now stored' }
});
const versionQuery = {
	name: 'version',
	in: 'query',
	required: true,
	schema: { type: 'integer', minimum: 1 }
};
const dwelling = {
	type: 'object',
	description: 'A dwelling (camelCase fields, with id, status, version, createdAt, updatedAt)'
};
const element = {
	type: 'object',
	description: 'An element with its stored lastResult (ElementResult), limit and pass'
};

export const paths: Record<string, unknown> = {
	'/api/v1/calculate': {
		post: {
			tags: ['calculation'],
			summary: 'Analyse an element: U-value (ISO 6946), profile, fRsi and Glaser (ISO 13788). Stateless.',
			parameters: [
				{
					name: 'detail',
					in: 'query',
					required: false,
					description:
						'`summary` leaves out the sampled profile and the per-month arrays (surface months, Glaser months, nodes, vapour profile); every figure, check, note, warning and caution stays. Default: full.',
					schema: { type: 'string', enum: ['full', 'summary'] }
				}
			],
			requestBody: jsonBody(elementInputSchema),
			responses: {
				'200': ok('The result', schema(elementResultSchema)),
				'400': errors['400'],
				'401': common['401']
			}
		}
	},
	'/api/v1/calculate/thickness': {
		post: {
			tags: ['calculation'],
			summary: 'Thickness of one layer that reaches a target U, rounded up to a product size. Stateless.',
			requestBody: jsonBody(thicknessRequestSchema),
			responses: {
				'200': ok(
					'outcome (thicker: the layer must grow; meets: it already reaches the target; thinner / thinnest: with mode thinnest, a thinner product size that still reaches it, or the thinnest there is), currentMm, uCurrent, uCurrentRounded, exactMm, roundedMm (null when nothing is proposed), uAtExact, uAtRounded, method, notes'
				),
				'400': errors['400'],
				'401': common['401']
			}
		}
	},
	'/api/v1/dwellings': {
		get: {
			tags: ['dwellings'],
			summary: 'List, search, filter, sort and paginate dwellings',
			parameters: queryParams(dwellingListQuerySchema),
			responses: { '200': ok('{ items, total, page, pageSize }'), ...errors }
		},
		post: {
			tags: ['dwellings'],
			summary: 'Create a dwelling (assessor, admin)',
			requestBody: jsonBody(dwellingFieldsSchema),
			responses: { '201': ok('Created', dwelling), ...errors }
		}
	},
	'/api/v1/dwellings/{dwellingId}': {
		parameters: [idParam('dwellingId')],
		get: {
			tags: ['dwellings'],
			summary: 'The dwelling with elements, limits, ΣU·A and mean U',
			responses: { '200': ok('Overview'), ...errors }
		},
		patch: {
			tags: ['dwellings'],
			summary: 'Change details (send version)',
			requestBody: jsonBody(dwellingUpdateSchema),
			responses: { '200': ok('Updated', dwelling), ...errors, ...stale }
		},
		delete: {
			tags: ['dwellings'],
			summary: 'Delete a dwelling without reports or audits',
			parameters: [versionQuery],
			responses: { '204': ok('Deleted'), ...errors, ...stale }
		}
	},
	'/api/v1/dwellings/{dwellingId}/copy': {
		parameters: [idParam('dwellingId')],
		post: {
			tags: ['dwellings'],
			summary: 'Copy with all elements as a new draft',
			requestBody: jsonBody(dwellingCopySchema),
			responses: { '201': ok('The copy', dwelling), ...errors }
		}
	},
	'/api/v1/dwellings/{dwellingId}/archive': {
		parameters: [idParam('dwellingId')],
		post: {
			tags: ['dwellings'],
			summary: 'Archive or restore to draft',
			requestBody: jsonBody(archiveSchema),
			responses: { '200': ok('Updated', dwelling), ...errors, ...stale }
		}
	},
	'/api/v1/dwellings/{dwellingId}/changes': {
		parameters: [idParam('dwellingId')],
		get: {
			tags: ['dwellings'],
			summary:
				'What differs between the dwelling now and its latest issued dwelling report: { report, changes: [{ elementId, element, field, before, after, by, at }, with junctionId instead of elementId, and the junction name as element, for a junction] } (report null before the first issue)',
			responses: { '200': ok('{ report, changes }'), ...errors }
		}
	},
	'/api/v1/dwellings/{dwellingId}/compare': {
		parameters: [idParam('dwellingId')],
		get: {
			tags: ['dwellings'],
			summary:
				'An as-built dwelling beside the design-stage dwelling it was copied from (POST …/copy with asBuilt: true): { design, asBuilt, pairs: [{ design, asBuilt, changes }], changed }; 404 when it was not copied from one',
			responses: { '200': ok('{ design, asBuilt, pairs, changed }'), ...errors }
		}
	},
	'/api/v1/dwellings/{dwellingId}/reopen': {
		parameters: [idParam('dwellingId')],
		post: {
			tags: ['dwellings'],
			summary:
				'Reopen an accepted dwelling, or one awaiting review, for changes, with a reason (logged with the decision it sets aside). Writes to such a dwelling are refused with 409 and code "reopen-required" until it is reopened.',
			requestBody: jsonBody(reopenSchema),
			responses: {
				'200': ok(
					'The dwelling, now changed after acceptance (or still awaiting review, reopened)',
					dwelling
				),
				...errors,
				...stale
			}
		}
	},
	'/api/v1/dwellings/{dwellingId}/elements': {
		parameters: [idParam('dwellingId')],
		get: {
			tags: ['elements'],
			summary: 'Element summaries of the dwelling',
			responses: { '200': ok('{ items }'), ...errors }
		},
		post: {
			tags: ['elements'],
			summary: 'Add an element; the server computes its result',
			requestBody: jsonBody(elementFieldsSchema),
			responses: { '201': ok('Created', element), ...errors }
		}
	},
	'/api/v1/dwellings/{dwellingId}/elements/order': {
		parameters: [idParam('dwellingId')],
		post: {
			tags: ['elements'],
			summary: "Set the order of the dwelling's elements (every id once; send the dwelling's version)",
			requestBody: jsonBody(elementOrderSchema),
			responses: { '200': ok('{ version, ids }'), ...errors, ...stale }
		}
	},
	'/api/v1/elements/{elementId}': {
		parameters: [idParam('elementId')],
		get: {
			tags: ['elements'],
			summary: 'An element with its stored result',
			responses: { '200': ok('Element', element), ...errors }
		},
		put: {
			tags: ['elements'],
			summary: 'Replace an element (send version); the server recomputes',
			requestBody: jsonBody(elementUpdateSchema),
			responses: { '200': ok('Updated', element), ...errors, ...stale }
		},
		delete: {
			tags: ['elements'],
			summary: 'Delete an element',
			parameters: [versionQuery],
			responses: { '204': ok('Deleted'), ...errors, ...stale }
		}
	},
	'/api/v1/elements/{elementId}/duplicate': {
		parameters: [idParam('elementId')],
		post: {
			tags: ['elements'],
			summary: 'Copy the element within its dwelling',
			responses: { '201': ok('The copy', element), ...errors }
		}
	}
};
