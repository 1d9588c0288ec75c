/**
 * The one way a form action reads its values and answers a refusal.
 *
 * Every action reads its post with `readForm(request, schema)` (sveltekit-superforms checking it against
 * the domain's zod schema). A form a person fills in is bound on its page with `superForm` and formsnap
 * and answered with `fail(400, { form })`, `refuseForm(form, e)` or `message(form, …)`; a form that is only
 * a button (its hidden id and version) posts with `use:enhance`, and its action answers `{ done }` or
 * `refuseAction(e)` (`{ error }`), which `ActionOutcome` shows. Uploads are streamed instead
 * (`server/csv/upload.ts`).
 */
import { error, fail } from '@sveltejs/kit';
import { setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { ZodValidationSchema } from 'sveltekit-superforms/adapters';
import type { z } from 'zod';
import { NotFoundError, refusalOf, type FieldIssue } from './errors';

/** A form post (or its FormData), checked against its schema; `form.valid` says whether it passed. */
export function readForm<S extends ZodValidationSchema>(
	data: Request | FormData | URLSearchParams,
	schema: S,
	id?: string
) {
	return superValidate(data, zod4(schema), id ? { id } : undefined);
}

/** A form's first showing in a load: its schema and the values it starts from. */
export function formFor<S extends ZodValidationSchema>(schema: S, defaults?: z.output<S>, id?: string) {
	return superValidate(zod4(schema), {
		...(defaults ? { defaults: defaults as never } : {}),
		...(id ? { id } : {})
	});
}

/** What a refusal tells the person in one line: the message, or each field with its reason. */
export function refusalText(e: { message: string; issues: readonly FieldIssue[] }): string {
	return e.issues.length ? e.issues.map((i) => `${i.path}: ${i.message}`).join('; ') : e.message;
}

/** The first problem of a form that did not pass its schema, as one line (for a button form). */
export function invalidText(form: SuperValidated<Record<string, unknown>>): string {
	const lines: string[] = [];
	const walk = (errors: unknown, path: string) => {
		if (Array.isArray(errors)) lines.push(`${path}: ${errors.join(' ')}`);
		else if (errors && typeof errors === 'object')
			for (const [k, v] of Object.entries(errors))
				walk(v, k === '_errors' ? path : path ? `${path}.${k}` : k);
	};
	walk(form.errors, '');
	return lines.join('; ') || 'The form was not understood; reload the page and try again.';
}

/**
 * A service's refusal of a button form, as the action's answer: `error`, what the person must know (`text`
 * words it, by default the message or each field with its reason), and `issues`, each problem's reason, for
 * a page that lists them; a record that is not there is the 404 page; anything unexpected is thrown on (a
 * 500 with a reference).
 */
export function refuseAction(
	e: unknown,
	text: (refusal: { message: string; issues: readonly FieldIssue[] }) => string = refusalText
) {
	const refusal = refusalOf(e);
	if (!refusal) throw e;
	if (refusal instanceof NotFoundError) error(404, refusal.message);
	return fail(refusal.status, { error: text(refusal), issues: refusal.issues.map((i) => i.message) });
}

/**
 * A service's refusal of a filled-in form: each issue beside its field (its path as the form names it;
 * `field` renames a service's path, or gives undefined to leave it to the form's own error), the rest as
 * the form's error (`text` words it, by default the message or each field with its reason); a record that
 * is not there is the 404 page; anything unexpected is thrown on.
 */
export function refuseForm<T extends Record<string, unknown>, M, In extends Record<string, unknown>>(
	form: SuperValidated<T, M, In>,
	e: unknown,
	options: {
		field?: (path: string) => string | undefined;
		text?: (refusal: { message: string; issues: readonly FieldIssue[] }) => string;
	} = {}
) {
	const refusal = refusalOf(e);
	if (!refusal) throw e;
	if (refusal instanceof NotFoundError) error(404, refusal.message);
	const field = options.field ?? ((p: string) => (p in form.data ? p : undefined));
	const unplaced: FieldIssue[] = [];
	for (const issue of refusal.issues) {
		const name = field(issue.path);
		if (name) setError(form, name as '', issue.message, { status: refusal.status });
		else unplaced.push(issue);
	}
	if (unplaced.length || !refusal.issues.length) {
		const rest = { message: refusal.message, issues: unplaced };
		setError(form, '', (options.text ?? refusalText)(rest), { status: refusal.status });
	}
	return fail(refusal.status, { form });
}
