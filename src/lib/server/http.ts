import { error, json } from '@sveltejs/kit';
import type { z } from 'zod';
import { fieldIssues } from '$lib/climates/schema';
import { ConflictError } from './errors';

/** The request's JSON body, or a 400 that says the body is not JSON. */
export async function readJson(request: Request): Promise<unknown> {
	const text = await request.text();
	if (text.trim() === '') return {};
	try {
		return JSON.parse(text);
	} catch {
		error(400, 'The request body is not valid JSON.');
	}
}

/** 400 with one entry per bad field: `{ message, issues: [{ path, message }] }`. */
export function invalid(err: z.ZodError, what = 'input'): Response {
	const issues = fieldIssues(err);
	return json(
		{
			message: `The ${what} has ${issues.length} problem${issues.length === 1 ? '' : 's'}: ${issues
				.slice(0, 5)
				.map((i) => `${i.path}: ${i.message}`)
				.join('; ')}${issues.length > 5 ? '; …' : ''}`,
			issues
		},
		{ status: 400 }
	);
}

/** Turns a known refusal into its HTTP answer; rethrows anything else. */
export function refusal(e: unknown): Response {
	if (e instanceof ConflictError) return json({ message: e.message }, { status: 409 });
	if (e instanceof Error && 'status' in e && e.status === 403) {
		return json({ message: e.message }, { status: 403 });
	}
	throw e;
}
