import { fail } from '@sveltejs/kit';
import { AppError, type FieldIssue } from '$lib/server/errors';

/** Issues keyed by the library's field names, as the material form shows them. */
const byField = (issues: FieldIssue[]) => issues.map((i) => ({ field: i.path, message: i.message }));

/**
 * A material save (new or revised) the library refused, as the material form shows it: the values as
 * typed, each issue and warning beside its field, the message above the form. Anything but an
 * AppError is thrown on.
 */
export function materialRefused(e: unknown, values: Record<string, unknown>) {
	if (e instanceof AppError)
		return fail(e.status, {
			values,
			issues: byField(e.issues),
			warnings: byField(e.warnings),
			error: e.message
		});
	throw e;
}
