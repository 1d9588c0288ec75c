/** OpenAPI path items of junctions and the stateless junction calculation, from the zod schemas the API validates with. */
import { junctionInputSchema } from '$lib/physics/junction';
import { junctionFieldsSchema, junctionUpdateSchema } from '$lib/junctions/schema';
import {
	common,
	conflict,
	currentVersion,
	fail,
	idParam,
	invalid,
	jsonBody,
	notFound,
	ok,
	schema,
	versionQuery
} from '$lib/server/openapi-kit';

const errors = {
	...invalid('Invalid input: each issue names the field (dotted path, `model.` for the model) and why'),
	...common,
	...notFound('Not found in your organisation')
};
const refused = conflict(
	'Stale version (changed by someone else since you loaded it), or a dwelling that may not change: archived, or accepted or awaiting review and not reopened (code "reopen-required")',
	{
		...currentVersion,
		code: {
			type: 'string',
			description: '"reopen-required" when the dwelling is reopened with a reason first'
		}
	}
);
const junction = {
	type: 'object',
	description:
		'A junction: id, dwellingId, name, type, lengthM (m), source (calculated | entered), dimensionSystem (internal | overall-internal | external), psiEntered and psiSource (entered), model (the JunctionInput computed), details (the builder’s choices), lastResult (JunctionCalculation: psi, psiBySystem, couplingCoefficient, flanks, heatFlows, surface {fRsi, coldest, critical, ruleOfThumb, months}, method, cautions, notes, run), engineVersion, version, createdAt, updatedAt'
};
const brief = {
	type: 'object',
	description:
		'id, name, type, lengthM, source, dimensionSystem, psi (used), psiSource, fRsi, surfacePass, engineVersion, version, updatedAt'
};

export const paths: Record<string, unknown> = {
	'/api/v1/junctions/calculate': {
		post: {
			tags: ['calculation'],
			summary:
				'Analyse a two-dimensional junction model (ISO 10211): heat flows, L2D, ψ (with flanks), fRsi, coldest point, probes. Stateless; counted against the calculation limit.',
			requestBody: jsonBody(junctionInputSchema),
			responses: {
				'200': ok('The result (JunctionResult)'),
				'400': errors['400'],
				'401': common['401'],
				'429': fail('Too many calculations in the last minute: wait Retry-After seconds')
			}
		}
	},
	'/api/v1/dwellings/{dwellingId}/junctions': {
		parameters: [idParam('dwellingId')],
		get: {
			tags: ['junctions'],
			summary: 'Junctions of the dwelling, with the ψ each uses',
			responses: {
				'200': ok('{ items }', { type: 'object', properties: { items: { type: 'array', items: brief } } }),
				...errors
			}
		},
		post: {
			tags: ['junctions'],
			summary:
				'Add a junction: calculated (built from the dwelling’s elements, or a free-form model) or with ψ entered from a named source; the server computes and stores the result',
			requestBody: jsonBody(schema(junctionFieldsSchema)),
			responses: { '201': ok('Created', junction), ...errors, ...refused }
		}
	},
	'/api/v1/junctions/{junctionId}': {
		parameters: [idParam('junctionId')],
		get: {
			tags: ['junctions'],
			summary: 'A junction with its model and stored result',
			responses: { '200': ok('Junction', junction), ...errors }
		},
		put: {
			tags: ['junctions'],
			summary: 'Replace a junction (send version); the server builds and computes again',
			requestBody: jsonBody(schema(junctionUpdateSchema)),
			responses: { '200': ok('Updated', junction), ...errors, ...refused }
		},
		delete: {
			tags: ['junctions'],
			summary: 'Delete a junction',
			parameters: [versionQuery],
			responses: { '204': ok('Deleted'), ...errors, ...refused }
		}
	}
};
