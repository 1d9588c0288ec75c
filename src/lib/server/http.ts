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
	refuseDeepNesting(text);
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch (e) {
		throw new ValidationError(
			[{ path: '(body)', message: `is not valid JSON: ${(e as Error).message}` }],
			'The request body is not valid JSON.'
		);
	}
	// A lone surrogate can only come in as a \u escape (the UTF-8 decoder replaces broken bytes).
	if (/\\u[dD][89abcdefABCDEF]/.test(text)) refuseLoneSurrogates(body);
	return body;
}

/** How deep a JSON body may nest; Envelo's deepest (an element's bridged layer) is five levels. */
export const MAX_JSON_DEPTH = 64;

/**
 * A 400 for a body nested deeper than MAX_JSON_DEPTH, found in one pass over the text before it is
 * parsed: the checks after parsing walk bodies recursively, and thousands of levels would exhaust the
 * stack (a 500) instead of answering what is wrong.
 */
function refuseDeepNesting(text: string): void {
	let depth = 0;
	let inString = false;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (inString) {
			if (c === 0x5c)
				i++; // backslash: skip the escaped character
			else if (c === 0x22) inString = false;
		} else if (c === 0x22) inString = true;
		else if (c === 0x5b || c === 0x7b) {
			if (++depth > MAX_JSON_DEPTH) {
				throw new ValidationError(
					[{ path: '(body)', message: `is nested more than ${MAX_JSON_DEPTH} levels deep` }],
					`The request body is nested more than ${MAX_JSON_DEPTH} levels deep; no request of Envelo's needs that many.`
				);
			}
		} else if (c === 0x5d || c === 0x7d) depth--;
	}
}

/** Half of a UTF-16 surrogate pair without its other half. */
const LONE_SURROGATE = /[\uD800-\uDBFF](?![\uDC00-\uDFFF])|(?<![\uD800-\uDBFF])[\uDC00-\uDFFF]/;

/**
 * A 400 naming the first key or text that holds half a surrogate pair (`"\ud800"`): it is no Unicode
 * character, PostgreSQL refuses it in JSON columns, and text columns would silently store U+FFFD instead.
 * Walks the body without recursion, so deep nesting costs no stack.
 */
function refuseLoneSurrogates(body: unknown): void {
	const stack: [unknown, string][] = [[body, '']];
	while (stack.length) {
		const [value, at] = stack.pop()!;
		if (typeof value === 'string') {
			if (LONE_SURROGATE.test(value)) {
				// a key at fault is named with its half pair written out
				const path = at.replace(new RegExp(LONE_SURROGATE, 'g'), (c) => `\\u${c.charCodeAt(0).toString(16)}`);
				throw new ValidationError(
					[
						{
							path: path || '(body)',
							message: 'holds half a surrogate pair (\\ud800–\\udfff), which is not text'
						}
					],
					`Text in the request${path ? ` (${path})` : ''} holds half a surrogate pair (\\ud800–\\udfff), which is not a character: remove it and try again.`
				);
			}
		} else if (value !== null && typeof value === 'object') {
			for (const [key, v] of Object.entries(value)) {
				// the path as far as a person reads it (deep nesting would make it megabytes long)
				const next = at.length > 120 ? at : (at ? `${at}.${key}` : key).slice(0, 121);
				if (LONE_SURROGATE.test(key)) stack.push([key, next]);
				stack.push([v, next]);
			}
		}
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

/**
 * Run a handler; expected refusals become their JSON answers. Given the request, a refusal made before
 * its body was read (a rate limit, a bad query parameter) reads and drops the body first: an answer
 * sent over an unread body leaves the connection stuck, and the client sees a reset, not the answer.
 */
export async function answer(fn: () => Promise<Response> | Response, request?: Request): Promise<Response> {
	try {
		return await fn();
	} catch (e) {
		const response = errorResponse(e);
		if (request && !request.bodyUsed) await discardBody(request);
		return response;
	}
}

/** Read a request's body to its end and drop it, chunk by chunk. */
export async function discardBody(request: Request): Promise<void> {
	const reader = request.body?.getReader();
	if (!reader) return;
	try {
		while (!(await reader.read()).done);
	} catch {
		// the client went away: nothing left to read
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
