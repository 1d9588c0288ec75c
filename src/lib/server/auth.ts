import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import PostgresAdapter from '@auth/pg-adapter';
import type { RequestEvent } from '@sveltejs/kit';
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
	// Auth.js builds its links from the request it is given. Envelo only ever gives it requests made by
	// onPublicOrigin() (sign-in, sign-out) or ones whose Host the hooks have checked (/auth/…), so the
	// host it "trusts" is always the configured origin.
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
	const origin = publicOrigin();
	const url = new URL(path, origin);
	const headers = new Headers(event.request.headers);
	for (const name of HOST_HEADERS) headers.delete(name);
	headers.set('host', url.host);
	headers.set('content-type', 'application/x-www-form-urlencoded');
	return { ...event, url, request: new Request(url, { method: 'POST', headers, body }) };
}
