import { test, expect } from '@playwright/test';
import fs from 'node:fs';
import path from 'node:path';
import { randomUUID } from 'node:crypto';
import { DEMO, db, sessionCookie } from './helpers';

// Every signed-in page and every API endpoint, found from the route files themselves so that a new route
// is covered the day it is added: anonymous callers are refused, and a member of another organisation
// never reaches this organisation's rows (common practice, no source: our own access rules).

const ROUTES = path.resolve('src/routes');
const NORTHFIELD = '00000000-0000-4000-8000-000000000001';

/** Param name → table whose rows it names (organisation-owned). */
const PARAM_TABLES: Record<string, string> = {
	dwellingId: 'dwellings',
	elementId: 'elements',
	materialId: 'materials',
	revisionId: 'material_revisions',
	climateId: 'climates',
	templateId: 'templates',
	limitTableId: 'limit_tables',
	reportId: 'reports',
	batchId: 'audit_batches',
	itemId: 'audit_items'
};

type Route = { kind: 'page' | 'api'; pattern: string; methods: string[] };

function walk(dir: string, segs: string[] = []): Route[] {
	const out: Route[] = [];
	for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
		if (entry.isDirectory()) {
			if (entry.name.startsWith('_')) continue;
			out.push(...walk(path.join(dir, entry.name), [...segs, entry.name]));
		}
	}
	const urlSegs = segs.filter((s) => !(s.startsWith('(') && s.endsWith(')')));
	const pattern = '/' + urlSegs.join('/');
	if (fs.existsSync(path.join(dir, '+page.svelte')) && segs.includes('(app)')) {
		out.push({ kind: 'page', pattern, methods: ['GET'] });
	}
	const server = path.join(dir, '+server.ts');
	if (fs.existsSync(server) && pattern.startsWith('/api/')) {
		const src = fs.readFileSync(server, 'utf8');
		const methods = [
			...src.matchAll(/export\s+(?:const|async function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g)
		].map((m) => m[1]);
		out.push({ kind: 'api', pattern, methods });
	}
	return out;
}

async function fill(pattern: string, realIds: boolean): Promise<{ url: string; ids: string[] }> {
	const ids: string[] = [];
	let url = pattern;
	for (const m of pattern.matchAll(/\[(?:\.\.\.)?(\w+)(?:=\w+)?\]/g)) {
		const table = PARAM_TABLES[m[1]];
		let value = randomUUID();
		if (realIds && table) {
			const row = await db()(table).where({ organisation_id: NORTHFIELD }).first('id');
			if (row) value = row.id;
		}
		if (!table && !m[1].toLowerCase().endsWith('id')) value = 'x';
		ids.push(value);
		url = url.replace(m[0], value);
	}
	return { url, ids };
}

const routes = walk(ROUTES);

test('the route list was found', () => {
	expect(routes.some((r) => r.pattern === '/dwellings')).toBe(true);
	expect(routes.some((r) => r.pattern === '/api/v1/me')).toBe(true);
});

test('anonymous callers are refused everywhere in the signed-in area and the API', async ({ request }) => {
	for (const r of routes) {
		const { url } = await fill(r.pattern, true);
		for (const method of r.methods) {
			const res = await request.fetch(url, {
				method,
				maxRedirects: 0,
				data: method === 'GET' ? undefined : {}
			});
			if (r.kind === 'page') {
				expect([303, 302], `${method} ${url}`).toContain(res.status());
				expect(res.headers()['location'], `${method} ${url}`).toMatch(/\/signin/);
			} else {
				expect(res.status(), `${method} ${url}`).toBe(401);
			}
		}
	}
});

test("a member of another organisation never reaches this organisation's rows", async ({ request }) => {
	const cookie = await sessionCookie(DEMO.otherAdmin);
	for (const r of routes) {
		const { url, ids } = await fill(r.pattern, true);
		for (const method of r.methods) {
			const res = await request.fetch(url, {
				method,
				maxRedirects: 0,
				headers: { cookie },
				data: method === 'GET' ? undefined : {}
			});
			const body = await res.text();
			expect(body, `${method} ${url} leaked the organisation's name`).not.toContain('Northfield');
			for (const id of ids) expect(body, `${method} ${url} echoed an id`).not.toContain(id);
			if (ids.length > 0) {
				expect([400, 403, 404, 405, 409, 422], `${method} ${url} gave ${res.status()}`).toContain(
					res.status()
				);
			} else if (method !== 'GET') {
				expect(res.status(), `${method} ${url}`).not.toBe(500);
			}
		}
	}
});
