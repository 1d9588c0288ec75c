// Shared replies of the library API (not a route: no + prefix).
import { json } from '@sveltejs/kit';
import { LibraryError } from '$lib/server/library';
import { CsvFileError, ImportRefused } from '$lib/server/library/import';

/** Turn an expected failure into its JSON reply; anything else is rethrown (500 with an error id). */
export function failure(e: unknown): Response {
	if (e instanceof LibraryError) {
		return json({ message: e.message, issues: e.issues, warnings: e.warnings }, { status: e.status });
	}
	if (e instanceof CsvFileError)
		return json({ message: e.message, code: e.code, line: e.line ?? null }, { status: 400 });
	if (e instanceof ImportRefused) return json({ message: e.message }, { status: e.status });
	throw e;
}

/** The JSON body of a request, or a 400 reply saying it is not JSON. */
export async function readJson(
	request: Request
): Promise<{ ok: true; body: Record<string, unknown> } | { ok: false; response: Response }> {
	try {
		const body = await request.json();
		if (body === null || typeof body !== 'object' || Array.isArray(body)) throw new Error('not an object');
		return { ok: true, body: body as Record<string, unknown> };
	} catch {
		return {
			ok: false,
			response: json({ message: 'The request body must be a JSON object.' }, { status: 400 })
		};
	}
}
