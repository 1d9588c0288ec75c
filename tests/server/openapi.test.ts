// The merged OpenAPI document at /api/v1/openapi.json: every area's fragment is in it, every endpoint
// (found by walking src/routes/api/v1) is described with each of its methods and nothing else is, and
// every error answer has the one shape `{ message, issues? }` of the API.
// OpenAPI 3.1.0 (OpenAPI Initiative, 2021), "Paths Object": templated paths use {name}; "Parameter
// Object": every template expression of a path has a path parameter of that name, which is required.
import { describe, it, expect, afterAll } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { hasDatabase, makeTeam, fakeEvent } from '../factories';

const ROUTES = join(process.cwd(), 'src/routes');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** Endpoints that are not described (yet): each must still be missing from the document. */
const UNDESCRIBED: string[] = [];

/**
 * `/api/v1/...` endpoints under a routes folder, as OpenAPI paths, with the methods each file exports:
 * `[dwellingId=uuid]` → `{dwellingId}`, `[reportId=uuid].pdf` → `{reportId}.pdf`. The document itself
 * (`openapi.json`) is left out.
 */
function endpoints(dir: string): { path: string; methods: string[] }[] {
	const out: { path: string; methods: string[] }[] = [];
	const walk = (d: string) => {
		for (const name of readdirSync(d)) {
			const p = join(d, name);
			if (statSync(p).isDirectory()) walk(p);
			else if (name === '+server.ts') {
				const route = relative(ROUTES, d)
					.split('/')
					.map((s) => s.replace(/\[(\w+)(?:=\w+)?\]/g, '{$1}'))
					.join('/');
				if (route === 'api/v1/openapi.json') continue;
				const src = readFileSync(p, 'utf8');
				const methods = METHODS.filter((m) =>
					new RegExp(`export\\s+(async\\s+)?(function|const)\\s+${m}\\b`).test(src)
				).map((m) => m.toLowerCase());
				out.push({ path: `/${route}`, methods });
			}
		}
	};
	walk(dir);
	return out.sort((a, b) => a.path.localeCompare(b.path));
}

describe.skipIf(!hasDatabase)('OpenAPI document', async () => {
	const openapi = await import('../../src/routes/api/v1/openapi.json/+server');

	afterAll(async () => {
		const { db, authPool } = await import('../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	const fetchDoc = async () => {
		const t = await makeTeam();
		const ev = fakeEvent(t.assessor, '/api/v1/openapi.json');
		const res = await openapi.GET(ev as never);
		expect(res.status).toBe(200);
		return (await res.json()) as { openapi: string; paths: Record<string, Record<string, any>> };
	};

	it('merges the audit, library, reports, climates and dwellings paths', async () => {
		const doc = await fetchDoc();
		expect(doc.openapi).toBe('3.1.0');
		const paths = Object.keys(doc.paths);
		for (const p of [
			'/api/v1/audit/batches',
			'/api/v1/audit/items/{itemId}/decision',
			'/api/v1/audit/returned',
			'/api/v1/materials',
			'/api/v1/reports',
			'/api/v1/climates',
			'/api/v1/limit-tables',
			'/api/v1/templates',
			'/api/v1/dwellings',
			'/api/v1/calculate'
		]) {
			expect(paths, p).toContain(p);
		}
		expect(JSON.stringify(doc)).not.toMatch(/undefined/);
	});

	it('describes every audit endpoint and method, with request bodies from the zod schemas', async () => {
		const doc = await fetchDoc();
		const found = endpoints(join(ROUTES, 'api/v1/audit'));
		expect(found.length).toBeGreaterThanOrEqual(9);
		for (const { path, methods } of found) {
			expect(doc.paths[path], path).toBeDefined();
			for (const m of methods) expect(doc.paths[path][m], `${m} ${path}`).toBeDefined();
		}
		const auditPaths = Object.keys(doc.paths).filter((p) => p.startsWith('/api/v1/audit'));
		expect(auditPaths.sort()).toEqual(found.map((f) => f.path));

		const json = (op: any) => op.requestBody.content['application/json'].schema;
		const newBatch = json(doc.paths['/api/v1/audit/batches'].post);
		expect(newBatch.required).toContain('name');
		expect(newBatch.properties.sampling).toBeDefined();
		const decision = json(doc.paths['/api/v1/audit/items/{itemId}/decision'].post);
		expect(decision.properties.decision.enum).toEqual(['accepted', 'accepted-with-advice', 'returned']);
		const resubmit = json(doc.paths['/api/v1/audit/items/{itemId}/resubmit'].post);
		expect(resubmit.required).toEqual(['comment']);
		expect(resubmit.properties.comment).toMatchObject({ type: 'string', minLength: 1, maxLength: 5000 });
		const params = doc.paths['/api/v1/audit/batches/{batchId}'].get.parameters;
		expect(params).toEqual([expect.objectContaining({ name: 'batchId', in: 'path', required: true })]);
	});

	it('describes every endpoint of /api/v1 with exactly the methods its handler exports', async () => {
		const doc = await fetchDoc();
		const found = endpoints(join(ROUTES, 'api/v1'));
		expect(found.map((f) => f.path)).toContain('/api/v1/reports/{reportId}.pdf');
		for (const p of UNDESCRIBED) {
			expect(
				found.map((f) => f.path),
				`${p} is no longer a route`
			).toContain(p);
			expect(doc.paths[p], `${p} is described now: take it off UNDESCRIBED`).toBeUndefined();
		}
		const routes = found.filter((f) => !UNDESCRIBED.includes(f.path));
		expect(Object.keys(doc.paths).sort()).toEqual(routes.map((f) => f.path).sort());
		for (const { path, methods } of routes) {
			const described = Object.keys(doc.paths[path]).filter((k) =>
				(METHODS as readonly string[]).includes(k.toUpperCase())
			);
			expect(described.sort(), path).toEqual([...methods].sort());
		}
	});

	it('declares a required path parameter for every template expression of a path', async () => {
		const doc = await fetchDoc();
		for (const [path, item] of Object.entries(doc.paths)) {
			const names = [...path.matchAll(/\{(\w+)\}/g)].map((m) => m[1]);
			for (const [m, op] of Object.entries(item)) {
				if (!(METHODS as readonly string[]).includes(m.toUpperCase())) continue;
				const params = [...(item.parameters ?? []), ...(op.parameters ?? [])].filter(
					(p: any) => p.in === 'path'
				);
				expect(params.map((p: any) => p.name).sort(), `${m} ${path}`).toEqual([...names].sort());
				for (const p of params) expect(p.required, `${m} ${path} ${p.name}`).toBe(true);
			}
		}
	});

	it('answers every refusal with { message, issues? }, and the extra members where they occur', async () => {
		const doc = await fetchDoc();
		const errorSchema = (path: string, method: string, status: string) =>
			doc.paths[path][method].responses[status].content['application/json'].schema;
		let refusals = 0;
		for (const [path, item] of Object.entries(doc.paths)) {
			for (const [m, op] of Object.entries(item)) {
				if (!(METHODS as readonly string[]).includes(m.toUpperCase())) continue;
				for (const status of Object.keys(op.responses).filter((s) => /^4\d\d$/.test(s))) {
					const s = errorSchema(path, m, status);
					expect(s.required, `${m} ${path} ${status}`).toEqual(['message']);
					expect(s.properties.message, `${m} ${path} ${status}`).toEqual({ type: 'string' });
					expect(s.properties.issues.items, `${m} ${path} ${status}`).toMatchObject({
						properties: { path: { type: 'string' }, message: { type: 'string' }, line: { type: 'integer' } },
						required: ['path', 'message']
					});
					refusals++;
				}
			}
		}
		expect(refusals).toBeGreaterThan(50);
		// A stale save names the version now stored; unusual material values are listed as warnings;
		// a refused CSV file names what is wrong with it and, when it can, the line.
		expect(
			errorSchema('/api/v1/dwellings/{dwellingId}', 'patch', '409').properties.currentVersion
		).toBeDefined();
		expect(errorSchema('/api/v1/elements/{elementId}', 'put', '409').properties.currentVersion).toBeDefined();
		expect(errorSchema('/api/v1/materials', 'post', '422').properties.warnings.items.required).toEqual([
			'path',
			'message'
		]);
		expect(errorSchema('/api/v1/materials/import', 'post', '400').properties).toMatchObject({
			code: { type: 'string' },
			line: { type: ['integer', 'null'] }
		});
	});
});
