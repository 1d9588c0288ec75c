import { fail } from '@sveltejs/kit';
import { ConflictError } from '$lib/server/errors';

/**
 * A save refused because the name is already taken in the organisation (a ConflictError): 409, with
 * the message under the form's name field and `body` (the values as typed, the action's tag…) kept for
 * the form. Anything else is thrown on.
 */
export function nameTaken<T extends object>(e: unknown, body: T) {
	if (e instanceof ConflictError) {
		return fail(409, { ...body, errors: { name: e.message } as Record<string, string> });
	}
	throw e;
}
