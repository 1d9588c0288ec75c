import { z } from 'zod';

export const signInSchema = z.object({
	email: z.email('Enter an e-mail address such as name@example.test.').max(254, 'That address is too long.'),
	next: z.string().max(500).optional()
});
