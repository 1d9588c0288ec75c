import { error, json } from '@sveltejs/kit';
import type { z } from 'zod';
import { AuditError } from '$lib/server/audit';

/** The JSON body of a request, or a 400 that says why it is not usable. */
export async function readJson(request: Request): Promise<unknown> {
	try {
		return await request.json();
	} catch {
		error(400, 'The request body must be JSON.');
	}
}

/** Validate with a zod schema; a 400 names every field at fault. */
export function validate<T extends z.ZodType>(schema: T, raw: unknown): z.infer<T> {
	const r = schema.safeParse(raw);
	if (!r.success) {
		const issues = r.error.issues.map((i) => ({
			path: i.path.map(String).join('.') || '(body)',
			message: i.message
		}));
		throw new AuditError(400, issues.map((i) => `${i.path}: ${i.message}`).join('; '), issues);
	}
	return r.data;
}

/** Expected failures as JSON with their status; anything else goes to handleError. */
export function failure(e: unknown): Response {
	if (e instanceof AuditError) return json({ message: e.message, issues: e.issues }, { status: e.status });
	throw e;
}
