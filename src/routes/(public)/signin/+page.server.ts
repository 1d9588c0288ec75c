import { fail, redirect } from '@sveltejs/kit';
import { formFor, readForm } from '$lib/server/forms';
import { onPublicOrigin, sendLinkLater } from '$lib/server/auth';
import { localPath } from '$lib/server/config';
import { isKnownAddress } from '$lib/server/members';
import { allowSignInAttempt } from '$lib/server/rate-limit';
import { signInSchema } from '$lib/members/forms';

const safeNext = (next: string | null | undefined) => localPath(next);

export const load = async ({ locals, url }) => {
	if (locals.user && locals.membership) redirect(303, safeNext(url.searchParams.get('next') ?? undefined));
	const form = await formFor(signInSchema, { email: '', next: url.searchParams.get('next') ?? '' });
	return { form };
};

export const actions = {
	default: async function requestLink(event) {
		const form = await readForm(event.request.clone(), signInSchema);
		if (!form.valid) return fail(400, { form });
		const email = form.data.email.trim().toLowerCase();
		const client = event.getClientAddress();
		if (!(await allowSignInAttempt(email, client))) {
			form.message = 'Too many sign-in requests. Wait a quarter of an hour and try again.';
			return fail(429, { form });
		}
		// Known and unknown addresses get the same answer, at once: the link is made and sent after the
		// answer, so neither the status, the headers nor the time taken tell whether the address has an
		// account.
		if (await isKnownAddress(email)) {
			const body = new URLSearchParams({
				providerId: 'nodemailer',
				email,
				redirectTo: safeNext(form.data.next)
			});
			sendLinkLater(onPublicOrigin(event, '/signin', body), email);
		}
		redirect(303, '/signin/check-email');
	}
};
