import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import PostgresAdapter from '@auth/pg-adapter';
import { isRedirect, type Handle, type RequestEvent } from '@sveltejs/kit';
import { publicOrigin, setting } from './config';
import { authPool } from './db';
import { createTransport, mailFrom, smtpSettings } from './mail';
import { SESSION_MAX_AGE_S, SESSION_UPDATE_AGE_S } from '$lib/server/members';

/** How long a sign-in link stays valid. */
export const SIGN_IN_LINK_MINUTES = 15;

/** The sign-in e-mail, in Envelo's own words. */
async function sendSignInLink({ identifier, url }: { identifier: string; url: string }) {
	const transport = createTransport();
	try {
		await transport.sendMail({
			from: mailFrom(),
			to: identifier,
			subject: 'Your Envelo sign-in link',
			text:
				`Follow this link to sign in to Envelo:\n\n${url}\n\n` +
				`It works once and expires in ${SIGN_IN_LINK_MINUTES} minutes. ` +
				`If you did not ask to sign in, ignore this message: nothing changes.\n`,
			html:
				`<p>Follow this link to sign in to Envelo:</p><p><a href="${url}">Sign in to Envelo</a></p>` +
				`<p>It works once and expires in ${SIGN_IN_LINK_MINUTES} minutes. If you did not ask to sign in, ignore this message: nothing changes.</p>`
		});
	} finally {
		transport.close();
	}
}

export const {
	handle: authHandle,
	signIn,
	signOut
} = SvelteKitAuth(async (): Promise<SvelteKitAuthConfig> => ({
	adapter: PostgresAdapter(authPool),
	secret: setting('AUTH_SECRET'),
	// Auth.js builds its links from the host of the request it is given, and refuses to run unless told
	// to trust it. Every request it sees is rebuilt on the configured ORIGIN first (onPublicOrigin for
	// sign-in and sign-out, handleAuthRoutes for /auth/…), with the caller's host headers removed, so the
	// host it trusts is always ORIGIN's, never one a caller sent.
	trustHost: true,
	providers: [
		Nodemailer({
			server: smtpSettings(),
			from: mailFrom(),
			maxAge: SIGN_IN_LINK_MINUTES * 60,
			sendVerificationRequest: sendSignInLink
		})
	],
	session: { strategy: 'database', maxAge: SESSION_MAX_AGE_S, updateAge: SESSION_UPDATE_AGE_S },
	pages: { signIn: '/signin', verifyRequest: '/signin/check-email', error: '/signin/problem' },
	callbacks: {
		// Return an explicit object: the callback's input carries the session token and the whole user row.
		session({ session, user }) {
			return {
				expires: session.expires,
				user: { id: user.id, email: user.email, name: user.name ?? null }
			} as typeof session;
		}
	}
}));

/** Headers that name a host or a scheme: never passed on to Auth.js from the request. */
const HOST_HEADERS = ['host', 'x-forwarded-host', 'x-forwarded-proto', 'x-forwarded-port', 'forwarded'];

/**
 * The event that Auth.js's signIn()/signOut() are called with: a form POST to `path` on the configured
 * public origin, carrying the caller's cookies but none of its host headers. Auth.js makes the sign-in
 * link from this request, so the link always points at Envelo's own origin, whatever Host or
 * X-Forwarded-Host the caller sent.
 */
export function onPublicOrigin(event: RequestEvent, path: string, body: URLSearchParams): RequestEvent {
	const url = new URL(path, publicOrigin());
	const headers = publicHeaders(event.request.headers, url);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	return { ...event, url, request: new Request(url, { method: 'POST', headers, body }) };
}

/** The caller's headers without any that name a host or a scheme, and with `host` set to `url`'s. */
function publicHeaders(from: Headers, url: URL): Headers {
	const headers = new Headers(from);
	for (const name of HOST_HEADERS) headers.delete(name);
	headers.set('host', url.host);
	return headers;
}

/**
 * Auth.js's own routes (/auth/…: the link's callback, its sign-out and session routes), given the
 * request rebuilt on the configured origin with the same path, query, method and body.
 */
export const handleAuthRoutes: Handle = async ({ event, resolve }) => {
	const url = new URL(event.url.pathname + event.url.search, publicOrigin());
	const { method } = event.request;
	const body = method === 'GET' || method === 'HEAD' ? undefined : await event.request.arrayBuffer();
	const request = new Request(url, { method, headers: publicHeaders(event.request.headers, url), body });
	return authHandle({ event: { ...event, url, request }, resolve });
};

/** Cookies that go nowhere: the sign-in link is requested after the answer has left. */
const NO_COOKIES: RequestEvent['cookies'] = {
	get: () => undefined,
	getAll: () => [],
	set: () => undefined,
	delete: () => undefined,
	serialize: () => ''
};

/**
 * Ask Auth.js for a sign-in link and e-mail it, without holding the answer: the caller answers every
 * address the same way at once. Auth.js ends its sign-in by redirecting (a thrown redirect); that and any
 * failure stay here (a failure is logged: the person asks again).
 */
export function sendLinkLater(event: RequestEvent, email: string): void {
	void Promise.resolve()
		.then(() => signIn({ ...event, cookies: NO_COOKIES }))
		.catch((e: unknown) => {
			if (isRedirect(e)) return;
			console.error(`[envelo] the sign-in link to ${email} could not be sent:`, e);
		});
}
