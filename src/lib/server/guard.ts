import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import type { Role } from '$lib/members/roles';

export type Member = {
	user: NonNullable<App.Locals['user']>;
	organisationId: string;
	organisationName: string;
	role: Role;
};

function isApi(event: Pick<RequestEvent, 'url'>): boolean {
	return event.url.pathname.startsWith('/api/');
}

/**
 * The one check every load, action and endpoint of the signed-in area makes: signed in, a member of an
 * organisation, and (when roles are given) holding one of them. Pages send anonymous visitors to sign in;
 * the API answers 401. Returns the member so queries can filter by their organisation.
 */
export function requireRole(event: Pick<RequestEvent, 'locals' | 'url'>, ...roles: Role[]): Member {
	const { user, membership } = event.locals;
	if (!user) {
		if (isApi(event)) error(401, 'Sign in first.');
		redirect(303, `/signin?next=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	}
	if (!membership) {
		if (isApi(event)) error(403, 'You are not a member of an organisation yet.');
		redirect(303, '/not-a-member');
	}
	if (roles.length > 0 && !roles.includes(membership.role)) {
		error(403, `This needs the ${roles.join(' or ')} role; you are ${membership.role}.`);
	}
	return { user, ...membership };
}

/** Convenience for routes any member may use. */
export const requireMember = (event: Pick<RequestEvent, 'locals' | 'url'>) => requireRole(event);
