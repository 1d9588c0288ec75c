// The merged OpenAPI document at /api/v1/openapi.json: every area's fragment is in it, and every audit
// endpoint (found by walking src/routes/api/v1/audit) is described with each of its methods.
// OpenAPI 3.1.0 (OpenAPI Initiative, 2021), "Paths Object": templated paths use {name}.
import { describe, it, expect, afterAll } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';
import { hasDatabase, makeTeam, fakeEvent } from '../factories';

const ROUTES = join(process.cwd(), 'src/routes');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** `/api/v1/...` endpoints under a routes folder, as OpenAPI paths, with the methods each file exports. */
function endpoints(dir: string): { path: string; methods: string[] }[] {
	const out: { path: string; methods: string[] }[] = [];
	const walk = (d: string) => {
		for (const name of readdirSync(d)) {
			const p = join(d, name);
			if (statSync(p).isDirectory()) walk(p);
			else if (name === '+server.ts') {
				const route = relative(ROUTES, d)
					.split('/')
					.map((s) => s.replace(/^\[(\w+)(=\w+)?\]$/, '{$1}'))
					.join('/');
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
});
