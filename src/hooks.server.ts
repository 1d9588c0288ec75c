import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { randomUUID } from 'node:crypto';
import { dev } from '$app/environment';
import { handleAuthRoutes } from '$lib/server/auth';
import { behindProxy, configuredOrigin, publicOrigin } from '$lib/server/config';
import { securityHeaders } from '$lib/server/http';
import { refusalOf, UnavailableError } from '$lib/server/errors';
import { getSignedInMember } from '$lib/server/members';
import { startWorkers } from '$lib/server/workers';
// Background workers register themselves when their module is imported (one line each, below).
import '$lib/server/audit/worker';
import '$lib/server/library/reach-worker';
import '$lib/server/outbox';

/** Auth.js's database-session cookie (the __Secure- form is used behind HTTPS). */
const SESSION_COOKIES = ['__Secure-authjs.session-token', 'authjs.session-token'];

type SignedIn = NonNullable<Awaited<ReturnType<typeof getSignedInMember>>>;

/**
 * The answer to "who holds this token" for a few seconds, so that a burst of requests from one person
 * (a page and its data, a client calling the API) asks PostgreSQL once. Any request that may change
 * data (every method but GET, HEAD and OPTIONS, bar the stateless calculations) bumps `generation` when
 * it finishes, and an answer read under an older generation is not used again: a sign-out, a role change
 * or a removal made through this server applies to the very next request. A change made behind the
 * server's back (another process, SQL by hand) applies within IDENTITY_TTL_MS.
 */
const IDENTITY_TTL_MS = 5000;
const IDENTITY_MAX = 10_000;
const identities = new Map<string, { found: SignedIn; at: number; generation: number }>();
let generation = 0;

const READ_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);
/** POST routes that change nothing. */
const PURE_POSTS = new Set(['/api/v1/calculate', '/api/v1/calculate/thickness']);

async function signedIn(token: string): Promise<SignedIn | null> {
	const now = Date.now();
	const hit = identities.get(token);
	if (hit && hit.generation === generation && now - hit.at < IDENTITY_TTL_MS) return hit.found;
	const seen = generation;
	const found = await getSignedInMember(token);
	if (!found) {
		identities.delete(token);
		return null;
	}
	if (identities.size >= IDENTITY_MAX) identities.clear();
	// Cached without the renewal: the cookie is renewed once, on the request that renewed the row.
	identities.set(token, { found: { ...found, renewedUntil: null }, at: now, generation: seen });
	return found;
}

/**
 * Who is asking: the signed-in user and their organisation and role, on every request, read in one query
 * from the session row Auth.js wrote (Auth.js itself still handles sign-in, the link and sign-out).
 */
const identify: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	event.locals.membership = null;
	const name = SESSION_COOKIES.find((n) => event.cookies.get(n));
	const token = name ? event.cookies.get(name) : undefined;
	if (name && token) {
		const found = await signedIn(token);
		if (found) {
			event.locals.user = found.user;
			event.locals.membership = found.membership;
			if (found.renewedUntil) {
				event.cookies.set(name, token, {
					path: '/',
					httpOnly: true,
					sameSite: 'lax',
					secure: name.startsWith('__Secure-'),
					expires: found.renewedUntil
				});
			}
		}
	}
	return resolve(event);
};

/** After a request that may have changed data (Auth.js's own sign-out included), forget who is who. */
const forgetAfterChanges: Handle = async ({ event, resolve }) => {
	if (READ_METHODS.has(event.request.method) || PURE_POSTS.has(event.url.pathname)) return resolve(event);
	try {
		return await resolve(event);
	} finally {
		generation++;
	}
};

const PUBLIC_PREFIXES = [
	'/signin',
	'/signout',
	'/auth/',
	'/verify',
	'/healthz',
	'/not-a-member',
	'/_app/',
	'/favicon',
	'/robots.txt'
];

/**
 * The signed-in area is guarded here once; every load, action and endpoint checks again with
 * requireRole(), so a route that forgets is still closed.
 */
const guard: Handle = async ({ event, resolve }) => {
	const path = event.url.pathname;
	const isPublic =
		path === '/' || PUBLIC_PREFIXES.some((p) => path === p.replace(/\/$/, '') || path.startsWith(p));
	if (!isPublic) {
		if (!event.locals.user) {
			if (path.startsWith('/api/')) return json({ message: 'Sign in first.' }, 401);
			return new Response(null, {
				status: 303,
				headers: { location: `/signin?next=${encodeURIComponent(path + event.url.search)}` }
			});
		}
		if (!event.locals.membership) {
			if (path.startsWith('/api/'))
				return json({ message: 'You are not a member of an organisation yet.' }, 403);
			return new Response(null, { status: 303, headers: { location: '/not-a-member' } });
		}
	}
	const response = await resolve(event);
	for (const [name, value] of Object.entries(securityHeaders(publicOrigin(), !isPublic, response.headers))) {
		response.headers.set(name, value);
	}
	return response;
};

function json(body: unknown, status: number) {
	return new Response(JSON.stringify(body), { status, headers: { 'content-type': 'application/json' } });
}

/**
 * Requests must name Envelo's configured origin. The Host header (or, behind a proxy that the deployment
 * declares with BEHIND_PROXY=true, the first X-Forwarded-Host) must be the host of ORIGIN; anything else
 * is refused before it reaches a route, so no link, redirect or cookie can ever be made for another host.
 * A page asked for under another name (say "localhost" for "127.0.0.1") is sent to the configured origin.
 */
const checkHost: Handle = async ({ event, resolve }) => {
	const origin = configuredOrigin();
	// vite dev without ORIGIN (production refuses to start without it, see init); a page's own fetch
	// during server rendering is answered in-process and carries no Host of its own.
	if (!origin || event.isSubRequest) return resolve(event);
	const expected = new URL(origin).host.toLowerCase();
	const headers = event.request.headers;
	const forwarded = behindProxy() ? headers.get('x-forwarded-host')?.split(',')[0]?.trim() : undefined;
	const host = (forwarded || headers.get('host') || '').toLowerCase();
	if (host === expected || event.url.pathname === '/healthz') return resolve(event);
	if (event.request.method === 'GET' || event.request.method === 'HEAD') {
		return new Response(null, {
			status: 308,
			headers: { location: new URL(event.url.pathname + event.url.search, origin).toString() }
		});
	}
	return new Response(`This server answers as ${origin} only.`, {
		status: 421,
		headers: { 'content-type': 'text/plain; charset=utf-8' }
	});
};

/**
 * Errors that stand for a refusal get their own status instead of 500: bad input that only the database
 * noticed (400) and a database that cannot be reached (503 with Retry-After), whether they were thrown
 * in a load or action (handleError marks them) or in a handle before any route ran (caught here).
 */
const refusals: Handle = async ({ event, resolve }) => {
	let response: Response;
	try {
		response = await resolve(event);
	} catch (e) {
		const r = refusalOf(e);
		if (!r) throw e;
		event.locals.refusal = {
			status: r.status,
			retryAfter: r instanceof UnavailableError ? r.retryAfter : undefined
		};
		response = json({ message: r.message }, 500);
	}
	const refusal = event.locals.refusal;
	if (refusal && response.status === 500) {
		response = new Response(response.body, { status: refusal.status, headers: response.headers });
		if (refusal.retryAfter) response.headers.set('retry-after', String(refusal.retryAfter));
	}
	return response;
};

/**
 * Auth.js only answers its own routes (/auth/…: the sign-in link, the callback, sign-out); elsewhere its
 * handle would only build its configuration again for each request. Nothing reads `locals.auth`: who is
 * asking comes from `identify`, and the sign-in and sign-out forms call Auth.js's signIn and signOut.
 */
const auth: Handle = (input) =>
	input.event.url.pathname.startsWith('/auth/') ? handleAuthRoutes(input) : input.resolve(input.event);

export const handle = sequence(refusals, checkHost, forgetAfterChanges, auth, identify, guard);

export const handleError: HandleServerError = ({ error, event, status, message }) => {
	// The framework's own refusals (404, 413 body too large, 415 a JSON body sent to a form action…).
	if (status < 500) return { message };
	const refusal = refusalOf(error);
	if (refusal) {
		event.locals.refusal = {
			status: refusal.status,
			retryAfter: refusal instanceof UnavailableError ? refusal.retryAfter : undefined
		};
		return { message: refusal.message };
	}
	const errorId = randomUUID().slice(0, 8);
	console.error(`[envelo] error ${errorId} on ${event.request.method} ${event.url.pathname}:`, error);
	return { message: 'Something went wrong on our side. Quote this reference if you report it.', errorId };
};

export const init: ServerInit = async () => {
	if (!dev && !configuredOrigin()) {
		throw new Error(
			'Set ORIGIN to the address people open Envelo at (e.g. https://envelo.example.test): every link Envelo e-mails is built from it.'
		);
	}
	await startWorkers();
};
