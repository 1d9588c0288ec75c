import { db } from './db';
import { setting } from './config';

/** Sign-in requests allowed per address and per client within the window (overridable for tests). */
export const SIGN_IN_LIMITS = {
	perAddress: Number(setting('SIGN_IN_PER_ADDRESS') ?? 5),
	perClient: Number(setting('SIGN_IN_PER_CLIENT') ?? 30),
	windowMinutes: 15
};

/**
 * Record a sign-in request and say whether it is within the limits. Kept in PostgreSQL so every server
 * process sees the same counts.
 */
export async function allowSignInAttempt(email: string, client: string): Promise<boolean> {
	const since = db.raw(`now() - interval '${SIGN_IN_LIMITS.windowMinutes} minutes'`);
	const [byAddress, byClient] = await Promise.all([
		db('sign_in_attempts')
			.where('email', email)
			.andWhere('created_at', '>', since)
			.count<{ count: number }[]>('* as count'),
		db('sign_in_attempts')
			.where('client', client)
			.andWhere('created_at', '>', since)
			.count<{ count: number }[]>('* as count')
	]);
	await db('sign_in_attempts').insert({ email, client });
	return (
		Number(byAddress[0].count) < SIGN_IN_LIMITS.perAddress &&
		Number(byClient[0].count) < SIGN_IN_LIMITS.perClient
	);
}
