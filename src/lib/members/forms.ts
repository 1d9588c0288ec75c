/** Form schemas (as a browser posts them) for signing in and the organisation's members. */
import { z } from 'zod';
import { ROLES } from '$lib/members/roles';

export const inviteSchema = z.object({
	email: z.email('Enter an e-mail address such as name@example.test.').max(254),
	name: z.string().trim().max(120, 'Keep the name under 120 characters.').optional(),
	role: z.enum(ROLES, { message: 'Choose assessor, supervisor or admin.' })
});

export const roleSchema = z.object({
	userId: z.uuid('Unknown member.'),
	role: z.enum(ROLES, { message: 'Choose assessor, supervisor or admin.' })
});

export const removeSchema = z.object({ userId: z.uuid('Unknown member.') });

/** The sign-in form: the address a link is sent to, and where to go after. */
export const signInSchema = z.object({
	email: z.email('Enter an e-mail address such as name@example.test.').max(254, 'That address is too long.'),
	next: z.string().max(500).optional()
});
