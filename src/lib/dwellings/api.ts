/** Small helpers for the JSON API routes of dwellings and elements. */
import { error, isHttpError, json } from '@sveltejs/kit';
import { ConflictError, NotFoundError, ValidationError } from './errors';

/** The request body as JSON, or a 400 that says why it is not. */
export async function readJson(request: Request): Promise<unknown> {
	const text = await request.text();
	if (!text.trim()) return {};
	try {
		return JSON.parse(text);
	} catch (e) {
		throw new ValidationError(
			[{ path: '(body)', message: `is not valid JSON: ${(e as Error).message}` }],
			'The body is not valid JSON.'
		);
	}
}

/** Run a handler; expected failures become 400 (with field issues), 404 or 409 JSON answers. */
export async function handle(fn: () => Promise<Response>): Promise<Response> {
	try {
		return await fn();
	} catch (e) {
		if (e instanceof ValidationError) return json({ message: e.message, issues: e.issues }, { status: 400 });
		if (e instanceof NotFoundError) return json({ message: 'Not found.' }, { status: 404 });
		if (e instanceof ConflictError)
			return json({ message: e.message, currentVersion: e.current ?? null }, { status: 409 });
		if (isHttpError(e)) throw e;
		throw e;
	}
}

/** `?version=` of a DELETE, required. */
export function versionParam(url: URL): number {
	const raw = url.searchParams.get('version');
	const v = raw === null ? NaN : Number(raw);
	if (!Number.isInteger(v) || v < 1) {
		throw new ValidationError([
			{ path: 'version', message: 'is required as ?version=N: the version you loaded' }
		]);
	}
	return v;
}

export const notFound = () => error(404, 'Not found.');
