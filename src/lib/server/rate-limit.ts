import { db, type Db } from './db';
import { RateLimitedError } from './errors';
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

/** Per-member limits on the calculation routes and on report e-mails (overridable for tests). */
export const MEMBER_LIMITS = {
	calculationsPerMinute: Number(setting('CALCULATIONS_PER_MINUTE') ?? 240),
	reportMailsPerHour: Number(setting('REPORT_MAILS_PER_HOUR') ?? 20)
};

/**
 * Recent calculation requests per member, in this process: a sliding minute. A bounded cache whose loss
 * (a restart, a second server) only resets the count; the calculations themselves store nothing.
 */
const calculations = new Map<string, number[]>();
const CALCULATION_MEMBERS_MAX = 10_000;

/** Count one calculation request; refuse (429) past the per-minute limit. */
export function takeCalculation(userId: string, now = Date.now()): void {
	const since = now - 60_000;
	const recent = (calculations.get(userId) ?? []).filter((t) => t > since);
	if (recent.length >= MEMBER_LIMITS.calculationsPerMinute) {
		const retryAfter = Math.max(1, Math.ceil((recent[0] + 60_000 - now) / 1000));
		throw new RateLimitedError(
			`Too many calculations: at most ${MEMBER_LIMITS.calculationsPerMinute} a minute. Wait ${retryAfter} s and try again.`,
			retryAfter
		);
	}
	recent.push(now);
	if (!calculations.has(userId) && calculations.size >= CALCULATION_MEMBERS_MAX) calculations.clear();
	calculations.set(userId, recent);
}

/** Refuse (429) a report e-mail past the member's hourly limit; counted from the outbox, so every server agrees. */
export async function checkReportMailLimit(userId: string, trx: Db = db): Promise<void> {
	const [{ count }] = await trx('mail_outbox')
		.where({ created_by: userId, purpose: 'report' })
		.andWhere('created_at', '>', trx.raw("now() - interval '1 hour'"))
		.count<{ count: string }[]>('* as count');
	if (Number(count) >= MEMBER_LIMITS.reportMailsPerHour) {
		throw new RateLimitedError(
			`You have sent ${count} report e-mails in the last hour, the most Envelo sends for one person. Wait a while and try again.`,
			600
		);
	}
}
