import { fail, redirect } from '@sveltejs/kit';
import { normaliseCode } from '$lib/server/reports';

export const actions = {
	default: async function find(event) {
		const raw = String((await event.request.formData()).get('code') ?? '');
		const code = normaliseCode(raw);
		if (!/^[0-9A-Z]{10}$/.test(code)) {
			return fail(400, {
				code: raw,
				error: 'A verification code has ten letters and digits, e.g. K7QM-2XPD-9R.'
			});
		}
		redirect(303, `/verify/${code}`);
	}
};
