import { redirect } from '@sveltejs/kit';
import { setError } from 'sveltekit-superforms';
import { normaliseCode } from '$lib/server/reports';
import { formFor, readForm } from '$lib/server/forms';
import { isVerificationCode, VERIFY_CODE_MESSAGE, verifyCodeFormSchema } from '$lib/reports/forms';

export const load = async () => ({ codeForm: await formFor(verifyCodeFormSchema, { code: '' }) });

export const actions = {
	default: async function find(event) {
		const form = await readForm(event.request, verifyCodeFormSchema);
		const code = normaliseCode(form.data.code);
		if (!form.valid || !isVerificationCode(code)) return setError(form, 'code', VERIFY_CODE_MESSAGE);
		redirect(303, `/verify/${code}`);
	}
};
