/**
 * OpenAPI 3.1 path items for the material library, with JSON schemas generated from the same zod
 * schemas the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { listQuerySchema, materialValuesObject, MATERIAL_STATUSES, LAMBDA_KINDS } from '$lib/library/schema';
import { MATERIAL_CATEGORIES } from '$lib/library/categories';
import {
	fail,
	idParam,
	issue,
	jsonBody,
	ok,
	queryParams,
	schema,
	type JsonSchema
} from '$lib/server/openapi-kit';

const num = { type: ['number', 'null'] };
const text = { type: ['string', 'null'] };
const summary = {
	type: 'object',
	properties: {
		id: { type: 'string', format: 'uuid', description: 'material id' },
		code: { type: 'string' },
		revisionId: { type: 'string', format: 'uuid', description: 'the current revision; store it in a layer' },
		revision: { type: 'integer' },
		name: { type: 'string' },
		manufacturer: { type: 'string' },
		category: { enum: [...MATERIAL_CATEGORIES] },
		lambda: { ...num, description: 'W/(m·K)' },
		lambdaKind: { enum: [...LAMBDA_KINDS, null] },
		resistance: { ...num, description: 'm²·K/W, fixed thermal resistance instead of λ' },
		muDry: num,
		muWet: num,
		sd: { ...num, description: 'm' },
		density: { ...num, description: 'kg/m³' },
		specificHeat: { ...num, description: 'J/(kg·K)' },
		thicknessMinMm: num,
		thicknessMaxMm: num,
		source: text,
		status: { enum: [...MATERIAL_STATUSES] }
	},
	required: ['id', 'code', 'revisionId', 'revision', 'name', 'category', 'status']
};
const revision = {
	allOf: [
		summary,
		{
			type: 'object',
			properties: {
				sourceIssued: { ...text, format: 'date' },
				sourceExpires: { ...text, format: 'date' },
				indicative: { type: 'boolean' },
				notes: text,
				verifiedAt: { ...text, format: 'date-time' },
				createdAt: { type: 'string', format: 'date-time' }
			}
		}
	]
};
const change = {
	type: 'object',
	properties: { field: { type: 'string' }, from: {}, to: {} },
	required: ['field', 'from', 'to']
};
const materialId = idParam('materialId');
const unusual = (description: string) =>
	fail(description, {
		warnings: {
			type: 'array',
			items: issue,
			description: 'values that are valid but unusual for the category, one per field'
		}
	});
const values = schema(materialValuesObject);
/** A body of material values with the members that steer the write. */
const valuesBody = (properties: Record<string, JsonSchema>) =>
	jsonBody({ allOf: [values, { type: 'object', properties }] });
const writeBody = valuesBody({
	confirmWarnings: { type: 'boolean', description: 'save values that are unusual for the category' }
});

export const paths: Record<string, unknown> = {
	'/api/v1/materials': {
		get: {
			summary: 'The library: search, filter, sort, one page',
			tags: ['Library'],
			parameters: queryParams(listQuerySchema),
			responses: {
				200: ok('A page of materials (current revisions)', {
					type: 'object',
					properties: {
						items: { type: 'array', items: summary },
						total: { type: 'integer' },
						page: { type: 'integer' },
						pageSize: { type: 'integer' }
					},
					required: ['items', 'total', 'page', 'pageSize']
				}),
				400: fail('A query parameter is not right')
			}
		},
		post: {
			summary: 'Add a material (revision 1, unverified); assessors and admins',
			tags: ['Library'],
			requestBody: writeBody,
			responses: {
				201: ok('The material', revision),
				400: fail('Values refused, field by field'),
				409: fail('The code is already in the library'),
				422: unusual('Values unusual for the category: send again with confirmWarnings')
			}
		}
	},
	'/api/v1/materials/{materialId}': {
		parameters: [materialId],
		get: {
			summary: 'A material with every revision, newest first',
			tags: ['Library'],
			responses: {
				200: ok('The material', {
					allOf: [revision, { type: 'object', properties: { revisions: { type: 'array', items: revision } } }]
				}),
				404: fail('No such material')
			}
		},
		put: {
			summary: 'Change values: writes a new revision when anything differs; assessors and admins',
			tags: ['Library'],
			requestBody: valuesBody({
				confirmWarnings: { type: 'boolean' },
				expectedRevisionId: { type: 'string', format: 'uuid' }
			}),
			responses: {
				200: ok('Outcome', {
					type: 'object',
					properties: {
						outcome: { enum: ['changed', 'unchanged'] },
						changes: { type: 'array', items: change },
						material: revision
					}
				}),
				400: fail('Values refused'),
				404: fail('No such material'),
				409: fail('A newer revision was written meanwhile'),
				422: unusual('Values unusual: confirm')
			}
		}
	},
	'/api/v1/materials/{materialId}/status': {
		parameters: [materialId],
		post: {
			summary:
				'Verify or supersede the current revision; supervisors and admins, never the revision’s author for verify',
			tags: ['Library'],
			requestBody: jsonBody({
				type: 'object',
				properties: {
					action: { enum: ['verify', 'supersede'] },
					expectedRevisionId: { type: 'string', format: 'uuid' }
				},
				required: ['action']
			}),
			responses: {
				200: ok('The current revision', revision),
				400: fail('Not right'),
				403: fail('Not allowed'),
				404: fail('No such material'),
				409: fail('Not in a state for that')
			}
		}
	},
	'/api/v1/materials/import': {
		post: {
			summary: 'CSV import: preview (dry run, nothing written) or commit (one transaction)',
			description:
				'The file is read as it arrives. In multipart/form-data, put the fields before the file part. ' +
				'Or send the file as the body (Content-Type: text/csv) with mode, token, confirmWarnings and mapping ' +
				'in the query string. A commit whose preview the server still keeps needs no file; otherwise it ' +
				'reads the file again and checks it gives the same token. A multipart request from outside a browser ' +
				'must send the Origin header of this site (cross-site form posts are refused).',
			tags: ['Library'],
			requestBody: {
				required: true,
				content: {
					'text/csv': { schema: { type: 'string', format: 'binary' } },
					'multipart/form-data': {
						schema: {
							type: 'object',
							properties: {
								file: {
									type: 'string',
									format: 'binary',
									description: 'UTF-8 CSV, comma or semicolon separated, at most 10 MB'
								},
								mode: { enum: ['preview', 'commit'], default: 'preview' },
								mapping: {
									type: 'string',
									description: 'JSON { "file header": field | null }, for headers Envelo does not know'
								},
								token: { type: 'string', description: 'from the preview; required to commit' },
								confirmWarnings: { enum: ['yes', 'no'] }
							}
						}
					}
				}
			},
			responses: {
				200: ok('A preview of every row, the mapping step, or the summary of a commit', {
					type: 'object',
					properties: { kind: { enum: ['preview', 'mapping', 'summary'] } },
					required: ['kind']
				}),
				400: fail('The file is refused (size, encoding, delimiter, header, truncation…)', {
					code: { type: 'string', description: 'what is wrong with the file as a whole' },
					line: { type: ['integer', 'null'], description: 'the line at fault, when it can be placed' }
				}),
				409: fail('The file or library changed since the preview'),
				422: fail('Rows with warnings need confirmWarnings')
			}
		}
	},
	'/api/v1/materials/export.csv': {
		get: {
			summary: 'The library as CSV, in the columns the import reads (formula-like cells neutralised)',
			tags: ['Library'],
			responses: { 200: { description: 'CSV', content: { 'text/csv': { schema: { type: 'string' } } } } }
		}
	},
	'/api/v1/materials/revision-check': {
		post: {
			summary: 'Layers of a build-up whose material has a newer revision, with what would change',
			tags: ['Library'],
			requestBody: jsonBody({
				type: 'object',
				properties: {
					buildUp: { type: 'object', properties: { layers: { type: 'array', items: { type: 'object' } } } }
				},
				required: ['buildUp']
			}),
			responses: {
				200: ok('One entry per layer to update', {
					type: 'array',
					items: {
						type: 'object',
						properties: {
							layerIndex: { type: 'integer' },
							materialId: { type: 'string', format: 'uuid' },
							fromRevisionId: { type: 'string', format: 'uuid' },
							toRevisionId: { type: 'string', format: 'uuid' },
							fromRevision: { type: 'integer' },
							toRevision: { type: 'integer' },
							changes: { type: 'array', items: change },
							to: { type: 'object', description: 'the values to copy into the layer' }
						}
					}
				}),
				400: fail('No build-up given')
			}
		}
	}
};
