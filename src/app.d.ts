// See https://svelte.dev/docs/kit/types#app.d.ts
import type { Role } from '$lib/members/roles';

declare global {
	namespace App {
		interface Error {
			message: string;
			/** Quoted by the user when reporting an unexpected error; the server log carries the same id. */
			errorId?: string;
		}
		interface Locals {
			/** Set by handleError when an error stands for a refusal (bad input the database saw, a database
			 * outage): the answer gets its status instead of 500. */
			refusal?: { status: number; retryAfter?: number };
			/** The signed-in person, or null. */
			user: { id: string; email: string; name: string | null } | null;
			/** Their organisation and role, or null when they are not a member of one (yet). */
			membership: {
				organisationId: string;
				organisationName: string;
				role: Role;
			} | null;
		}
		interface PageData {
			user?: App.Locals['user'];
			membership?: App.Locals['membership'];
		}
	}
}

export {};
