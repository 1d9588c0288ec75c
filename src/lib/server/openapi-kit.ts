/**
 * The pieces every domain's `openapi.ts` builds its path items from: JSON schemas generated from the
 * zod schemas the endpoints validate with, JSON bodies and answers, lists, path and query parameters,
 * and the one error answer of the API, `{ message, issues?: [{ path, message, line? }] }` (see
 * `./errors.ts`), with the extra members some answers carry.
 * OpenAPI 3.1.0 (OpenAPI Initiative, 2021): schemas are JSON Schema draft 2020-12.
 */
import { z } from 'zod';

export type JsonSchema = Record<string, unknown>;

/** The JSON schema of a zod schema: what a client sends (`input`, default) or what it gets back (`output`). */
export const schema = (s: z.ZodType, io: 'input' | 'output' = 'input'): JsonSchema =>
	z.toJSONSchema(s, { io, unrepresentable: 'any' }) as JsonSchema;

export const uuid = { type: 'string', format: 'uuid' };
export const dateTime = { type: 'string', format: 'date-time' };

/** `{ 'application/json': { schema } }`. */
export const json = (s: JsonSchema) => ({ 'application/json': { schema: s } });

/** A required JSON request body, from a JSON schema or straight from a zod schema. */
export const jsonBody = (s: JsonSchema | z.ZodType) => ({
	required: true,
	content: json(s instanceof z.ZodType ? schema(s) : s)
});

/** An answer with a JSON body, or with none when no schema is given. */
export const ok = (description: string, s?: JsonSchema) => ({
	description,
	...(s ? { content: json(s) } : {})
});

/** `{ items: [...] }`. */
export const list = (items: JsonSchema) => ({
	type: 'object',
	properties: { items: { type: 'array', items } },
	required: ['items']
});

/** A stored record: the schema with its `id`, `createdAt` and `updatedAt`. */
export const withMeta = (s: JsonSchema) => ({
	allOf: [
		s,
		{ type: 'object', properties: { id: uuid, createdAt: dateTime, updatedAt: dateTime }, required: ['id'] }
	]
});

/** A uuid path parameter. */
export const idParam = (name: string) => ({ name, in: 'path', required: true, schema: uuid });

/** One optional query parameter per property of a zod object schema. */
export const queryParams = (s: z.ZodType) =>
	Object.entries((schema(s).properties ?? {}) as Record<string, unknown>).map(([name, p]) => ({
		name,
		in: 'query',
		required: false,
		schema: p
	}));

/** One field (dotted path) or CSV line at fault, and why. */
export const issue = {
	type: 'object',
	properties: {
		path: { type: 'string', description: 'the field at fault, as a dotted path' },
		message: { type: 'string' },
		line: { type: 'integer', description: 'the line of the file, for CSV input' }
	},
	required: ['path', 'message']
};

/** The error answer, with the extra members (`currentVersion`, `warnings`, `code`…) of some answers. */
export const problem = (extra: Record<string, JsonSchema> = {}) => ({
	type: 'object',
	properties: {
		message: { type: 'string' },
		issues: { type: 'array', items: issue },
		...extra
	},
	required: ['message']
});

/** An error answer. */
export const fail = (description: string, extra: Record<string, JsonSchema> = {}) =>
	ok(description, problem(extra));

/** 401 and 403, which every endpoint of the signed-in API may answer. */
export const common = {
	'401': fail('Not signed in.'),
	'403': fail('The role does not allow this.')
};
export const invalid = (description = 'Invalid input: one issue per field.') => ({
	'400': fail(description)
});
export const notFound = (description = 'No such record in your organisation.') => ({
	'404': fail(description)
});
export const conflict = (description: string, extra: Record<string, JsonSchema> = {}) => ({
	'409': fail(description, extra)
});

/** A stale save or delete: somebody changed the record since the caller loaded it. */
export const currentVersion = {
	currentVersion: { type: 'integer', description: 'the version now stored, when the version sent is stale' }
};
/** `?version=N` of a DELETE: the version the caller loaded. */
export const versionQuery = {
	name: 'version',
	in: 'query',
	required: true,
	description: 'the version you loaded; 409 with currentVersion when it is stale',
	schema: { type: 'integer', minimum: 1 }
};
/** A stored record with its version, raised by one on every update. */
export const versioned = (s: Record<string, unknown>) => ({
	allOf: [
		s,
		{ type: 'object', properties: { version: { type: 'integer', minimum: 1 } }, required: ['version'] }
	]
});

/** GET of one record of the organisation: the record, or 404. */
export const readOne = (tags: string[], summary: string, description: string, record: JsonSchema) => ({
	tags,
	summary,
	responses: { '200': ok(description, record), ...common, ...notFound() }
});

/** DELETE of a versioned record, with `?version=`: 204, or 409 when something uses it or it is stale. */
export const deleteVersioned = (tags: string[], summary: string, conflictDescription: string) => ({
	tags,
	summary,
	parameters: [versionQuery],
	responses: {
		'204': ok('Deleted.'),
		...invalid('No ?version= given.'),
		...common,
		...notFound(),
		...conflict(conflictDescription, currentVersion)
	}
});
