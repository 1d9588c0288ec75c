import { setError, type SuperValidated } from 'sveltekit-superforms';
import { refuseForm } from '$lib/server/forms';
import { refusalOf } from '$lib/server/errors';
import { materialFieldOf, type MaterialForm } from '$lib/library/forms';

/** What the material form shows beside its fields besides their errors: the warnings to confirm. */
export type MaterialFormMessage = { warnings: { field: string; message: string }[] };

/** The material form as an action reads it. */
export type MaterialFormRead = SuperValidated<MaterialForm, MaterialFormMessage>;

/**
 * A material save (new or revised) the library refused, as the material form shows it: the values as
 * typed, each issue beside its field, each warning beside its field (with the box that confirms them),
 * the library's message above the form. A record that is not there is the 404 page; anything that is not
 * a refusal is thrown on.
 */
export function materialRefused(form: MaterialFormRead, e: unknown) {
	const refusal = refusalOf(e);
	const failure = refuseForm(form, e, { field: materialFieldOf });
	// every issue found its field: the message still says, above the form, what happened
	if (refusal && !form.errors._errors?.length)
		setError(form, '', refusal.message, { status: refusal.status });
	form.message = { warnings: (refusal?.warnings ?? []).map((w) => ({ field: w.path, message: w.message })) };
	return failure;
}
