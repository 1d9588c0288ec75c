/**
 * OpenAPI 3.1 path items for supervisor audits: batches (create, read, recompute again, items, summary),
 * one audited dwelling, decisions, resubmissions and the "returned to me" list. Request schemas come from
 * the zod schemas the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { decisionSchema, newBatchSchema, resubmitSchema } from '$lib/audit/schemas';
import { DECISIONS, FLAG_CODES, SEVERITIES } from '$lib/audit/flags';
import { DWELLING_STATUSES } from '$lib/dwellings/kinds';
import { fail, idParam, jsonBody, list, ok, uuid } from '$lib/server/openapi-kit';

const nullable = (type: string, extra: Record<string, unknown> = {}) => ({ type: [type, 'null'], ...extra });

const itemState = { type: 'string', enum: ['awaiting-review', 'resubmitted', ...DECISIONS] };
const flag = {
	type: 'object',
	properties: {
		code: { type: 'string', enum: [...FLAG_CODES] },
		severity: { type: 'string', enum: [...SEVERITIES] },
		reason: { type: 'string' },
		elementId: uuid,
		layerIndex: { type: 'integer', minimum: 0 },
		junctionId: { ...uuid, description: 'the junction the flag is about' }
	},
	required: ['code', 'severity', 'reason']
};
const progress = {
	type: 'object',
	description: 'state of the recompute of the batch',
	properties: {
		state: { type: 'string', enum: ['queued', 'running', 'done', 'failed'] },
		done: { type: 'integer' },
		total: { type: 'integer' },
		flagged: { type: 'integer' },
		added: { type: 'integer' },
		startedAt: { type: 'string', format: 'date-time' },
		finishedAt: { type: 'string', format: 'date-time' },
		heartbeat: { type: 'string', format: 'date-time' },
		error: { type: 'string' }
	}
};
const batch = {
	type: 'object',
	properties: {
		id: uuid,
		name: { type: 'string' },
		filter: { type: 'object', description: 'the filter or references the batch was drawn from' },
		sampling: { type: 'object', description: 'the sampling rule' },
		seed: { type: 'string', description: 'seed of the reproducible random sample' },
		status: { type: 'string', enum: ['open', 'closed'] },
		progress,
		createdBy: uuid,
		createdByName: nullable('string'),
		createdAt: { type: 'string', format: 'date-time' },
		updatedAt: { type: 'string', format: 'date-time' },
		counts: {
			type: 'object',
			properties: {
				items: { type: 'integer' },
				decided: { type: 'integer' },
				returned: { type: 'integer' },
				flagged: { type: 'integer' },
				population: { type: 'integer' }
			}
		}
	}
};
const item = {
	type: 'object',
	properties: {
		id: uuid,
		batchId: uuid,
		dwellingId: uuid,
		reference: { type: 'string' },
		address: { type: 'string' },
		programme: nullable('string'),
		assessorId: nullable('string', { format: 'uuid' }),
		assessorName: nullable('string'),
		dwellingStatus: { type: 'string', enum: [...DWELLING_STATUSES] },
		pickedBecause: { type: 'string', description: 'why the sample took this dwelling' },
		flags: { type: 'array', items: flag },
		elements: { type: 'integer' },
		decision: { type: ['string', 'null'], enum: [...DECISIONS, null] },
		comment: nullable('string'),
		decidedBy: nullable('string', { format: 'uuid' }),
		decidedByName: nullable('string'),
		decidedAt: nullable('string', { format: 'date-time' }),
		resubmissions: { type: 'integer' },
		recomputedAt: nullable('string', { format: 'date-time' }),
		state: itemState
	}
};
const itemDetail = {
	allOf: [
		item,
		{
			type: 'object',
			properties: {
				recompute: {
					type: ['object', 'null'],
					description: 'recomputed figures per element beside the issued ones'
				},
				batchName: { type: 'string' },
				batchStatus: { type: 'string', enum: ['open', 'closed'] },
				history: {
					type: 'array',
					items: {
						type: 'object',
						properties: {
							id: { type: 'integer' },
							action: { type: 'string' },
							at: { type: 'string', format: 'date-time' },
							who: nullable('string'),
							details: { type: 'object' }
						}
					}
				}
			}
		}
	]
};
const returnedItem = {
	allOf: [
		item,
		{
			type: 'object',
			properties: {
				batchName: { type: 'string' },
				reissued: { type: 'boolean', description: 'a dwelling report was issued after the return' },
				latestReportNumber: nullable('string'),
				latestIssuedAt: nullable('string', { format: 'date-time' })
			}
		}
	]
};
const summary = {
	type: 'object',
	properties: {
		items: { type: 'integer' },
		byState: { type: 'object', additionalProperties: { type: 'integer' } },
		flagsByCode: { type: 'array', items: { type: 'object' } },
		perAssessor: { type: 'array', items: { type: 'object' } },
		uByKind: { type: 'array', items: { type: 'object' } }
	}
};

const tags = ['Audit'];

export const paths: Record<string, unknown> = {
	'/api/v1/audit/batches': {
		get: {
			tags,
			summary: "The organisation's audit batches",
			responses: { 200: ok('Batches', list(batch)) }
		},
		post: {
			tags,
			summary: 'Create a batch from a filter or a list of dwelling references; the recompute is queued',
			description: 'Supervisors and admins only.',
			requestBody: jsonBody(newBatchSchema),
			responses: {
				201: ok('The new batch', batch),
				400: fail('The request is not valid (every field at fault is named)'),
				403: fail('Only supervisors and admins create batches')
			}
		}
	},
	'/api/v1/audit/batches/{batchId}': {
		get: {
			tags,
			summary: 'One batch with the progress of its recompute',
			parameters: [idParam('batchId')],
			responses: { 200: ok('The batch', batch), 404: fail('No such batch in your organisation') }
		}
	},
	'/api/v1/audit/batches/{batchId}/items': {
		get: {
			tags,
			summary: 'The dwellings of a batch with their flags and decisions',
			parameters: [idParam('batchId')],
			responses: { 200: ok('Items', list(item)), 404: fail('No such batch in your organisation') }
		}
	},
	'/api/v1/audit/batches/{batchId}/summary': {
		get: {
			tags,
			summary: 'Counts of a batch: by state, by flag, per assessor, U-values by element kind',
			parameters: [idParam('batchId')],
			responses: { 200: ok('Summary', summary), 404: fail('No such batch in your organisation') }
		}
	},
	'/api/v1/audit/batches/{batchId}/refresh': {
		post: {
			tags,
			summary: "Recompute the batch again with today's engine and library (queued)",
			description: 'Supervisors and admins only.',
			parameters: [idParam('batchId')],
			responses: {
				202: ok('Queued', { type: 'object', properties: { state: { type: 'string' } } }),
				403: fail('Only supervisors and admins recompute batches'),
				404: fail('No such batch in your organisation')
			}
		}
	},
	'/api/v1/audit/items/{itemId}': {
		get: {
			tags,
			summary: 'One audited dwelling: flags, recomputed figures beside the issued ones, history',
			parameters: [idParam('itemId')],
			responses: { 200: ok('The item', itemDetail), 404: fail('No such audit item in your organisation') }
		}
	},
	'/api/v1/audit/items/{itemId}/decision': {
		post: {
			tags,
			summary: 'Decide: accepted, accepted with advice, or returned for correction (with a comment)',
			description: 'Supervisors and admins only. A comment is required unless the decision is accepted.',
			parameters: [idParam('itemId')],
			requestBody: jsonBody(decisionSchema),
			responses: {
				200: ok('The decided item', item),
				400: fail('The request is not valid'),
				403: fail('Only supervisors and admins decide'),
				404: fail('No such audit item in your organisation'),
				409: fail('The item cannot be decided in its present state')
			}
		}
	},
	'/api/v1/audit/items/{itemId}/resubmit': {
		post: {
			tags,
			summary: 'Answer a return after issuing the dwelling report again',
			description: "The dwelling's assessor or an admin.",
			parameters: [idParam('itemId')],
			requestBody: jsonBody(resubmitSchema),
			responses: {
				200: ok('The resubmitted item', item),
				400: fail('The request is not valid'),
				403: fail("Only the dwelling's assessor (or an admin) resubmits it"),
				404: fail('No such audit item in your organisation'),
				409: fail('Not returned, or no dwelling report issued since the return')
			}
		}
	},
	'/api/v1/audit/returned': {
		get: {
			tags,
			summary: 'Dwellings returned to the caller for correction (admins: every returned dwelling)',
			responses: { 200: ok('Returned dwellings', list(returnedItem)) }
		}
	}
};
