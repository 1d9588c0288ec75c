/**
 * OpenAPI 3.1 path items for reports: issue, read, download the PDF, e-mail through the outbox. Request
 * schemas come from the zod schemas the endpoints validate with. Merged into /api/v1/openapi.json.
 */
import { emailSchema, issueSchema } from '$lib/reports/schema';
import { fail, idParam, jsonBody, ok, uuid } from '$lib/server/openapi-kit';

const reportId = idParam('reportId');

const summary = {
	type: 'object',
	properties: {
		id: { type: 'string', format: 'uuid' },
		number: { type: 'string', description: 'report number, the same for every revision' },
		revision: { type: 'integer', minimum: 1 },
		scope: { type: 'string', enum: ['element', 'dwelling'] },
		dwellingId: { type: 'string', format: 'uuid' },
		elementId: { type: ['string', 'null'], format: 'uuid' },
		elementName: { type: ['string', 'null'] },
		supersedesId: { type: ['string', 'null'], format: 'uuid' },
		supersededById: { type: ['string', 'null'], format: 'uuid' },
		engineVersion: { type: 'string' },
		verificationCode: { type: 'string', pattern: '^[0-9A-Z]{10}$' },
		sha256: { type: 'string', pattern: '^[0-9a-f]{64}$' },
		issuedAt: { type: 'string', format: 'date-time' },
		issuedBy: { type: 'object', properties: { id: { type: 'string' }, name: { type: 'string' } } },
		filename: { type: 'string' },
		bytes: { type: 'integer' }
	}
};
const mail = {
	type: 'object',
	properties: {
		id: { type: 'string', format: 'uuid' },
		reportId: { type: ['string', 'null'], format: 'uuid' },
		to: { type: 'string' },
		subject: { type: 'string' },
		status: { type: 'string', enum: ['queued', 'sent', 'failed'] },
		attempts: { type: 'integer' },
		lastError: { type: ['string', 'null'] },
		createdAt: { type: 'string', format: 'date-time' },
		sentAt: { type: ['string', 'null'], format: 'date-time' },
		nextAttemptAt: { type: 'string', format: 'date-time' }
	}
};

export const paths: Record<string, unknown> = {
	'/api/v1/reports': {
		get: {
			tags: ['Reports'],
			summary: "A dwelling's issued reports, newest first",
			parameters: [{ name: 'dwellingId', in: 'query', required: true, schema: uuid }],
			responses: {
				200: ok('Reports', { type: 'object', properties: { items: { type: 'array', items: summary } } }),
				400: fail('dwellingId missing or not an id'),
				404: fail('No such dwelling in your organisation')
			}
		},
		post: {
			tags: ['Reports'],
			summary: 'Issue a dwelling report, or an element report with elementId (assessor, admin)',
			description:
				'Freezes every input and result, renders the PDF, stores it with its SHA-256 and a verification code. A further issue of the same dwelling or element is the next revision and supersedes the previous one. A dwelling report marks the dwelling issued.',
			requestBody: jsonBody(issueSchema),
			responses: {
				201: ok('Issued', summary),
				400: fail(
					'Invalid body, or elements that cannot be reported (each named with its field and reason in issues)'
				),
				403: fail('Role may not issue'),
				404: fail('No such dwelling or element in your organisation'),
				409: fail('The dwelling is archived')
			}
		}
	},
	'/api/v1/reports/{reportId}': {
		get: {
			tags: ['Reports'],
			summary: 'One issued report with the e-mails sent with it (?snapshot=1 adds the frozen snapshot)',
			parameters: [reportId, { name: 'snapshot', in: 'query', schema: { type: 'string', enum: ['1'] } }],
			responses: {
				200: ok('Report', {
					...summary,
					properties: {
						...summary.properties,
						pdfUrl: { type: 'string' },
						mail: { type: 'array', items: mail }
					}
				}),
				404: fail('No such report in your organisation')
			}
		}
	},
	'/api/v1/reports/{reportId}.pdf': {
		get: {
			tags: ['Reports'],
			summary: 'The issued PDF, byte for byte as stored (x-content-sha256 header); ?download=1 to save',
			parameters: [reportId, { name: 'download', in: 'query', schema: { type: 'string', enum: ['1'] } }],
			responses: {
				200: {
					description: 'PDF',
					content: { 'application/pdf': { schema: { type: 'string', format: 'binary' } } }
				},
				404: fail('No such report in your organisation')
			}
		}
	},
	'/api/v1/reports/{reportId}/email': {
		post: {
			tags: ['Reports'],
			summary:
				'E-mail the report with its PDF attached (assessor, admin); queued in the outbox and retried until sent',
			parameters: [reportId],
			requestBody: jsonBody(emailSchema),
			responses: {
				202: ok('Queued', mail),
				400: fail('Invalid address or message'),
				403: fail('Role may not send'),
				404: fail('No such report in your organisation')
			}
		}
	}
};
