import { SvelteKitAuth, type SvelteKitAuthConfig } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import PostgresAdapter from '@auth/pg-adapter';
import { setting } from './config';
import { authPool } from './db';
import { createTransport, mailFrom, smtpSettings } from './mail';
import { SESSION_MAX_AGE_S, SESSION_UPDATE_AGE_S } from './members';

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
