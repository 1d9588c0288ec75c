/**
 * OpenAPI 3.1 path items for evidence: upload (multipart, read as it arrives), list, delete, and the
 * supervisor's requests on an audit item. The files themselves are served outside the API, at
 * `/evidence/{id}` and `/evidence/{id}/thumbnail` (members of the organisation only; the `url` and
 * `thumbnailUrl` of each item). Merged into /api/v1/openapi.json.
 */
import { evidenceAnswerSchema, evidenceRequestSchema, EVIDENCE_TYPES, THUMBNAIL_PX } from './index';
import { dateTime, fail, idParam, jsonBody, list, ok, uuid } from '$lib/server/openapi-kit';

const person = {
	type: 'object',
	properties: { id: uuid, name: { type: ['string', 'null'] } },
	required: ['id']
};

const evidence = {
	type: 'object',
	properties: {
		id: uuid,
		dwellingId: uuid,
		elementId: { type: ['string', 'null'], format: 'uuid' },
		elementName: { type: ['string', 'null'] },
		layerIndex: {
			type: ['integer', 'null'],
			minimum: 0,
			description: "0-based position in the element's build-up when uploaded (layer 1 is 0)"
		},
		layerName: { type: ['string', 'null'] },
		name: { type: 'string', description: 'the file name as uploaded, made safe' },
		contentType: { type: 'string', enum: Object.keys(EVIDENCE_TYPES), description: 'by content' },
		bytes: { type: 'integer', minimum: 1 },
		sha256: { type: 'string', pattern: '^[0-9a-f]{64}$', description: 'SHA-256 of the file as uploaded' },
		uploadedBy: person,
		createdAt: dateTime,
		reportedAt: {
			type: ['string', 'null'],
			format: 'date-time',
			description: 'when an issued report first listed it; from then on it is kept'
		},
		url: { type: 'string', description: 'the file (members of the organisation only)' },
		thumbnailUrl: {
			type: ['string', 'null'],
			description: `a ${THUMBNAIL_PX} px JPEG thumbnail, for photos`
		},
		deletable: { type: 'boolean', description: 'whether the caller may delete it now' }
	},
	required: ['id', 'dwellingId', 'name', 'contentType', 'bytes', 'sha256', 'createdAt', 'url']
};

const request = {
	type: 'object',
	properties: {
		id: uuid,
		dwellingId: uuid,
		auditItemId: uuid,
		batchId: uuid,
		requestedBy: person,
		note: { type: 'string' },
		dueDate: { type: 'string', format: 'date' },
		createdAt: dateTime,
		answeredAt: { type: ['string', 'null'], format: 'date-time' },
		answeredBy: { oneOf: [person, { type: 'null' }] },
		answerEvidenceId: { type: ['string', 'null'], format: 'uuid' },
		overdue: { type: 'boolean', description: 'open and past its due date (UTC)' }
	},
	required: ['id', 'auditItemId', 'note', 'dueDate', 'createdAt']
};

const upload = {
	type: 'object',
	properties: {
		elementId: { type: 'string', format: 'uuid', description: 'an element of the dwelling' },
		layerIndex: {
			type: 'integer',
			minimum: 0,
			description: 'a layer of that element, 0-based (needs elementId)'
		},
		file: { type: 'string', format: 'binary', description: 'JPEG, PNG or PDF by content, at most 15 MB' }
	},
	required: ['file']
};

const itemId = idParam('itemId');

export const paths: Record<string, unknown> = {
	'/api/v1/dwellings/{dwellingId}/evidence': {
		get: {
			tags: ['Evidence'],
			summary: "The dwelling's evidence (oldest first) and its audits' evidence requests (newest first)",
			parameters: [idParam('dwellingId')],
			responses: {
				200: ok('Evidence and requests', {
					type: 'object',
					properties: {
						items: { type: 'array', items: evidence },
						requests: { type: 'array', items: request }
					},
					required: ['items', 'requests']
				}),
				404: fail('No such dwelling in your organisation')
			}
		},
		post: {
			tags: ['Evidence'],
			summary:
				'Upload a photo or document as evidence of the dwelling, an element or a layer (assessor, admin)',
			description:
				'multipart/form-data with the fields before the file. The file is read as it arrives: its SHA-256 is computed, its type is decided by its content (JPEG, PNG or PDF; the name does not count), and photos get a thumbnail. The upload answers every open evidence request of the dwelling.',
			parameters: [idParam('dwellingId')],
			requestBody: { required: true, content: { 'multipart/form-data': { schema: upload } } },
			responses: {
				201: ok('Stored', evidence),
				400: fail(
					'Not multipart, no file, an empty file, a type other than JPEG, PNG or PDF by content (saying what it is), an unreadable image, fields after the file, or a layer the element does not have'
				),
				403: fail('Role may not upload'),
				404: fail('No such dwelling, or no such element in it'),
				409: fail('The dwelling is archived'),
				413: fail('The file is larger than 15 MB'),
				503: fail('The file store cannot be reached (nothing was saved)')
			}
		}
	},
	'/api/v1/evidence/{evidenceId}': {
		delete: {
			tags: ['Evidence'],
			summary: 'Delete evidence with its files, until an issued report lists it (uploader, assessor, admin)',
			description:
				'Every report of a dwelling lists all its evidence; once a report of the dwelling has been issued after the upload, the evidence is part of that record and is kept. Requests it answered are open again.',
			parameters: [idParam('evidenceId')],
			responses: {
				204: ok('Deleted'),
				403: fail('Neither its uploader, the dwelling’s assessor nor an admin'),
				404: fail('No such evidence in your organisation'),
				409: fail('Listed in an issued report, or the dwelling is archived')
			}
		}
	},
	'/api/v1/audit/items/{itemId}/evidence-requests': {
		get: {
			tags: ['Evidence', 'Audit'],
			summary: "An audit item's evidence requests, newest first",
			parameters: [itemId],
			responses: {
				200: ok('Requests', list(request)),
				404: fail('No such audit item in your organisation')
			}
		},
		post: {
			tags: ['Evidence', 'Audit'],
			summary: 'Request evidence on an audited dwelling, with a note and a due date (supervisor, admin)',
			description:
				'Answered by the next upload to the dwelling, or explicitly. Logged in the audit item’s history.',
			parameters: [itemId],
			requestBody: jsonBody(evidenceRequestSchema),
			responses: {
				201: ok('Requested', request),
				400: fail('No note, or a due date that is not a date from today on'),
				403: fail('Role may not request evidence'),
				404: fail('No such audit item in your organisation'),
				409: fail('The batch is closed')
			}
		}
	},
	'/api/v1/audit/items/{itemId}/evidence-requests/{requestId}/answer': {
		post: {
			tags: ['Evidence', 'Audit'],
			summary: 'Mark a request answered without a new upload, optionally naming the evidence',
			parameters: [itemId, idParam('requestId')],
			requestBody: jsonBody(evidenceAnswerSchema),
			responses: {
				200: ok('Answered', request),
				400: fail('evidenceId is not an id'),
				404: fail('No such request on this audit item, or no such evidence of the dwelling'),
				409: fail('Already answered')
			}
		}
	}
};
