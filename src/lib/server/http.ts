/**
 * The HTTP side of the kernel: read a JSON body, validate it, and turn an expected refusal into its
 * answer. Every `+server.ts` handler goes through these, so every refusal has the same shape:
 * `{ message, …extra }` with the status of its error (see `./errors.ts`).
 */
import { json } from '@sveltejs/kit';
import type { z } from 'zod';
import { fieldIssues, issuesSentence } from '$lib/validation';
import { RateLimitedError, refusalOf, UnavailableError, ValidationError } from './errors';

/** The request's JSON body (an empty body is `{}`), or a 400 that says the body is not JSON. */
export async function readJson(request: Request): Promise<unknown> {
	const text = await request.text();
	if (text.trim() === '') return {};
	try {
		return JSON.parse(text);
	} catch (e) {
		throw new ValidationError(
			[{ path: '(body)', message: `is not valid JSON: ${(e as Error).message}` }],
			'The request body is not valid JSON.'
		);
	}
}

/** The request's JSON body, which must be an object (`{}` when empty). */
export async function readJsonObject(request: Request): Promise<Record<string, unknown>> {
	const body = await readJson(request);
	if (body === null || typeof body !== 'object' || Array.isArray(body)) {
		throw new ValidationError(
			[{ path: '(body)', message: 'must be a JSON object' }],
			'The request body must be a JSON object.'
		);
	}
	return body as Record<string, unknown>;
}

/** Validate with a zod schema; a 400 names every field at fault. */
export function parseWith<T extends z.ZodType>(schema: T, raw: unknown, what = 'request'): z.output<T> {
	const r = schema.safeParse(raw);
	if (r.success) return r.data;
	const issues = fieldIssues(r.error);
	throw new ValidationError(issues, issuesSentence(issues, what));
}

/** A failed zod parse as its 400 answer, for handlers that parse with `safeParse` themselves. */
export function invalid(error: z.ZodError, what = 'request'): Response {
	const issues = fieldIssues(error);
	return errorResponse(new ValidationError(issues, issuesSentence(issues, what)));
}

/** An expected refusal as its JSON answer; anything else is rethrown (handleError: 500 with a reference). */
export function errorResponse(e: unknown): Response {
	const refusal = refusalOf(e);
	if (!refusal) throw e;
	const headers: Record<string, string> = {};
	if (refusal instanceof UnavailableError || refusal instanceof RateLimitedError)
		headers['retry-after'] = String(refusal.retryAfter);
	return json(refusal.body(), { status: refusal.status, headers });
}

/** Run a handler; expected refusals become their JSON answers. */
export async function answer(fn: () => Promise<Response> | Response): Promise<Response> {
	try {
		return await fn();
	} catch (e) {
		return errorResponse(e);
	}
}

/** `?version=` of a DELETE, required: the version the caller loaded. */
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

/** A PDF as the answer, never cached (reports are the organisation's, not public). */
export function pdfResponse(pdf: Buffer, filename: string, disposition: 'inline' | 'attachment' = 'inline') {
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-length': String(pdf.length),
			'content-disposition': `${disposition}; filename="${filename}"`,
			'cache-control': 'private, no-store'
		}
	});
}

/**
 * Headers every answer carries: no sniffing, same-origin referrers, no camera/microphone/location;
 * `Cache-Control: no-store` for the signed-in area and the API (an organisation's data never sits in a
 * shared or back-button cache) unless the route set its own; HSTS when Envelo is served over HTTPS.
 */
export function securityHeaders(
	origin: string,
	isPrivate: boolean,
	existing: Headers
): Record<string, string> {
	const out: Record<string, string> = {
		'x-content-type-options': 'nosniff',
		'referrer-policy': 'same-origin',
		'permissions-policy': 'camera=(), microphone=(), geolocation=()'
	};
	if (isPrivate && !existing.has('cache-control')) out['cache-control'] = 'private, no-store';
	if (origin.startsWith('https:')) out['strict-transport-security'] = 'max-age=31536000; includeSubDomains';
	return out;
}
