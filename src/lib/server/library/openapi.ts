/**
 * OpenAPI 3.1 path items for the material library, with JSON schemas generated from the same zod
 * schemas the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { listQuerySchema, materialValuesObject, MATERIAL_STATUSES, LAMBDA_KINDS } from '$lib/library/schema';
import { DWELLING_STATUSES } from '$lib/dwellings/kinds';
import { moveRequestSchema, reachQuerySchema } from './reach-schema';
import { MATERIAL_CATEGORIES } from '$lib/library/categories';
import {
	fail,
	idParam,
	uuid,
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

/** The headline figures of an element's result: U as calculated and as reported, moisture, fRsi. */
const outcome = {
	type: 'object',
	properties: {
		u: { ...num, description: 'W/(m²·K), unrounded' },
		uRounded: { ...num, description: 'W/(m²·K), as reported' },
		moisture: { enum: ['none', 'dries', 'accumulates', null], description: 'ISO 13788 Glaser outcome' },
		surfacePass: { type: ['boolean', 'null'], description: 'the fRsi surface-humidity check' },
		pass: { type: ['boolean', 'null'], description: 'U as reported meets the limit (null: no limit or no U)' }
	}
};
const reachElement = {
	type: 'object',
	properties: {
		id: uuid,
		name: { type: 'string' },
		kind: { type: 'string' },
		position: { type: 'integer' },
		version: { type: 'integer' },
		layers: {
			type: 'array',
			description: 'the layers of the material on an older revision',
			items: {
				type: 'object',
				properties: {
					layerIndex: { type: 'integer' },
					fromRevisionId: uuid,
					fromRevision: { type: 'integer' }
				}
			}
		},
		limit: { ...num, description: 'maximum U for the kind from the dwelling’s limit table, W/(m²·K)' },
		now: { ...outcome, description: 'the stored result' },
		next: { anyOf: [outcome, { type: 'null' }], description: 'recomputed with the current revision' },
		error: { ...text, description: 'why the recompute with the current revision fails' },
		passFlip: { enum: ['to-fail', 'to-pass', null] },
		moistureChanged: { type: 'boolean' },
		surfaceChanged: { type: 'boolean' },
		stale: { type: 'boolean', description: 'the stored result is from another engine version' }
	},
	required: ['id', 'name', 'kind', 'layers', 'now', 'next', 'passFlip', 'moistureChanged']
};
const reachDwelling = {
	type: 'object',
	properties: {
		id: uuid,
		reference: { type: 'string' },
		address: { type: 'string' },
		status: { enum: [...DWELLING_STATUSES] },
		statusLabel: { type: 'string' },
		reopened: { type: 'boolean' },
		needsReopening: {
			type: 'boolean',
			description: 'accepted, or awaiting review and not reopened: its elements are skipped by a move'
		},
		refusal: text,
		issuedReports: { type: 'integer', description: 'issued dwelling reports (every revision)' },
		lastIssuedAt: { ...text, format: 'date-time' },
		changesSinceIssue: { type: ['integer', 'null'] },
		auditDecision: { ...text, description: 'the latest audit decision on the dwelling, in any batch' },
		audit: {
			type: ['object', 'null'],
			description: 'the dwelling’s latest audit item; open while it waits for a decision in an open batch',
			properties: {
				itemId: uuid,
				batchId: uuid,
				batchName: { type: 'string' },
				open: { type: 'boolean' },
				decision: text,
				decidedAt: { ...text, format: 'date-time' }
			}
		},
		limitTable: { type: ['object', 'null'] },
		elements: { type: 'array', items: reachElement }
	},
	required: ['id', 'reference', 'status', 'needsReopening', 'issuedReports', 'elements']
};
const count = { type: 'integer' };
const reach = {
	type: 'object',
	properties: {
		material: {
			type: 'object',
			properties: { id: uuid, code: { type: 'string' }, name: { type: 'string' } }
		},
		to: {
			type: 'object',
			description: 'the current revision, which the elements would move to',
			properties: { id: uuid, revision: count, status: { type: 'string' } }
		},
		olderRevisions: { type: 'array', items: count },
		onSupersededCurrent: {
			type: ['object', 'null'],
			description:
				'when the current revision is itself superseded (no newer revision yet): the work that uses it',
			properties: { elements: count, dwellings: count }
		},
		totals: {
			type: 'object',
			description: 'over every dwelling, not only this page',
			properties: Object.fromEntries(
				[
					'elements',
					'dwellings',
					'flips',
					'toFail',
					'toPass',
					'moistureChanges',
					'surfaceChanges',
					'errors',
					'withIssuedReports',
					'needsReopening',
					'accepted',
					'inOpenAudit',
					'staleResults'
				].map((k) => [k, count])
			)
		},
		distinctInputs: count,
		page: count,
		pageSize: count,
		pages: count,
		dwellings: { type: 'array', items: reachDwelling }
	},
	required: ['material', 'to', 'totals', 'dwellings', 'page', 'pages']
};
const move = {
	type: 'object',
	properties: {
		id: uuid,
		materialId: uuid,
		toRevisionId: uuid,
		toRevision: { type: ['integer', 'null'] },
		state: { enum: ['queued', 'running', 'done', 'failed'] },
		total: count,
		done: count,
		moved: count,
		already: count,
		skipped: count,
		failed: count,
		error: text,
		createdAt: { type: 'string', format: 'date-time' },
		finishedAt: { ...text, format: 'date-time' },
		background: { type: 'boolean' }
	},
	required: ['id', 'state', 'total', 'done']
};
const moveWithItems = {
	type: 'object',
	properties: {
		move,
		items: {
			type: 'array',
			description: 'each element done so far, refused ones first (at most 500)',
			items: {
				type: 'object',
				properties: {
					elementId: uuid,
					outcome: { enum: ['moved', 'already', 'skipped', 'failed'] },
					reason: { ...text, description: 'why it was not moved, e.g. reopen the dwelling first' },
					fromRevision: { type: ['integer', 'null'] },
					toRevision: { type: ['integer', 'null'] },
					version: { type: ['integer', 'null'], description: 'the element’s version after the move' },
					elementName: text,
					dwellingId: { type: ['string', 'null'], format: 'uuid' },
					dwellingReference: text
				}
			}
		}
	},
	required: ['move', 'items']
};

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
	'/api/v1/materials/verify': {
		post: {
			summary:
				'Verify several current revisions at once; supervisors and admins. A revision that may not be verified (not current, not unverified, written by the caller) is left as it was and listed with the reason',
			tags: ['Library'],
			requestBody: jsonBody({
				type: 'object',
				properties: {
					revisionIds: {
						type: 'array',
						items: { type: 'string', format: 'uuid' },
						minItems: 1,
						maxItems: 200
					}
				},
				required: ['revisionIds']
			}),
			responses: {
				200: ok('What was verified and what was left, with why', {
					type: 'object',
					properties: {
						verified: {
							type: 'array',
							items: {
								type: 'object',
								properties: {
									revisionId: { type: 'string', format: 'uuid' },
									materialId: { type: 'string', format: 'uuid' },
									code: { type: 'string' },
									revision: { type: 'integer' }
								}
							}
						},
						skipped: {
							type: 'array',
							items: {
								type: 'object',
								properties: {
									revisionId: { type: 'string', format: 'uuid' },
									code: text,
									reason: { type: 'string' }
								}
							}
						}
					}
				}),
				400: fail('Not right'),
				403: fail('Not allowed')
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
	},
	'/api/v1/materials/{materialId}/reach': {
		parameters: [materialId],
		get: {
			summary:
				'Elements on an older revision of the material, grouped by dwelling, with the effect of the current one',
			description:
				'Every element of the organisation with a layer of the material on a revision older than the current one, ' +
				'with its U now (stored result) and recomputed with the current revision, the limit, whether pass/fail ' +
				'or the moisture outcome would change, and per dwelling its status and issued reports. One page of ' +
				'dwellings; the totals count every one. Steady-state results that support, not replace, professional judgement.',
			tags: ['Library'],
			parameters: queryParams(reachQuerySchema),
			responses: {
				200: ok('The reach (one page of dwellings)', reach),
				400: fail('A query parameter is not right'),
				404: fail('No such material')
			}
		}
	},
	'/api/v1/materials/{materialId}/reach/move': {
		parameters: [materialId],
		post: {
			summary: 'Move elements to the current revision; assessors and admins',
			description:
				'Each element is saved through the element service: versioned, recomputed, logged (move-revision) and ' +
				'counted as a change since issue. Elements of a dwelling that must be reopened first are skipped with ' +
				'the reason; an element already on the revision is not moved again. Up to 50 elements are moved at once ' +
				'(200); more run as a background job (202) followed by GET …/reach/move/{moveId}.',
			tags: ['Library'],
			requestBody: jsonBody(moveRequestSchema),
			responses: {
				200: ok('The move, done, with the outcome of each element', moveWithItems),
				202: ok('The move, queued as a background job', moveWithItems),
				400: fail('The body is not right'),
				403: fail('Not allowed'),
				404: fail('No such material'),
				409: fail('The revision is not the current one')
			}
		}
	},
	'/api/v1/materials/{materialId}/reach/move/{moveId}': {
		parameters: [materialId, idParam('moveId')],
		get: {
			summary: 'A move with its progress and each element’s outcome so far',
			tags: ['Library'],
			responses: { 200: ok('The move', moveWithItems), 404: fail('No such move of this material') }
		}
	},
	'/api/v1/materials/{materialId}/reach/references.csv': {
		parameters: [materialId],
		get: {
			summary: 'References of the dwellings with elements on an older revision, as CSV (for an audit batch)',
			tags: ['Library'],
			responses: {
				200: {
					description: 'CSV with a reference column',
					content: { 'text/csv': { schema: { type: 'string' } } }
				},
				404: fail('No such material')
			}
		}
	}
};
