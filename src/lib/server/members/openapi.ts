/** OpenAPI 3.1 path items for the caller's own membership. Merged into /api/v1/openapi.json. */
import { ROLES } from '$lib/members/roles';
import { common, ok, uuid } from '$lib/server/openapi-kit';

const me = {
	type: 'object',
	properties: {
		user: {
			type: 'object',
			properties: { id: uuid, email: { type: 'string' }, name: { type: ['string', 'null'] } },
			required: ['id', 'email']
		},
		organisation: {
			type: 'object',
			properties: { id: uuid, name: { type: 'string' } },
			required: ['id', 'name']
		},
		role: { type: 'string', enum: [...ROLES] }
	},
	required: ['user', 'organisation', 'role']
};

export const paths: Record<string, unknown> = {
	'/api/v1/me': {
		get: {
			tags: ['members'],
			summary: 'Who the caller is',
			description: 'The signed-in user, their organisation and their role in it.',
			responses: { '200': ok('The caller.', me), ...common }
		}
	}
};
