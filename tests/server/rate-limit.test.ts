import { describe, expect, it, afterAll } from 'vitest';
import { hasDatabase, makeTeam, tdb } from '../factories';

// Per-member limits are Envelo's own rules (common practice, no source): 429 Too Many Requests with
// Retry-After (RFC 6585 §4; section from memory).
describe.skipIf(!hasDatabase)('per-member limits', async () => {
	const rl = await import('../../src/lib/server/rate-limit');
	const { RateLimitedError } = await import('../../src/lib/server/errors');
	afterAll(async () => {
		const { db, authPool } = await import('../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('calculations: the limit per minute, then 429 with a wait, and free again a minute later', () => {
		const t0 = 1_000_000;
		const who = `calc-${Date.now()}`;
		for (let i = 0; i < rl.MEMBER_LIMITS.calculationsPerMinute; i++) rl.takeCalculation(who, t0 + i);
		let refused: unknown;
		try {
			rl.takeCalculation(who, t0 + 1000);
		} catch (e) {
			refused = e;
		}
		expect(refused).toBeInstanceOf(RateLimitedError);
		expect((refused as InstanceType<typeof RateLimitedError>).status).toBe(429);
		expect((refused as InstanceType<typeof RateLimitedError>).retryAfter).toBeGreaterThan(0);
		expect(() => rl.takeCalculation(who, t0 + 61_000 + rl.MEMBER_LIMITS.calculationsPerMinute)).not.toThrow();
		expect(() => rl.takeCalculation(`${who}-other`, t0 + 1000)).not.toThrow();
	});

	it('report e-mails: counted from the outbox per member and hour', async () => {
		const t = await makeTeam();
		const rows = Array.from({ length: rl.MEMBER_LIMITS.reportMailsPerHour }, (_, i) => ({
			organisation_id: t.org.id,
			purpose: 'report',
			to_address: `client${i}@example.test`,
			subject: 's',
			body_text: 'b',
			created_by: t.assessor.id,
			status: 'sent'
		}));
		await tdb()('mail_outbox').insert(rows.slice(1));
		await expect(rl.checkReportMailLimit(t.assessor.id)).resolves.toBeUndefined();
		await tdb()('mail_outbox').insert(rows[0]);
		await expect(rl.checkReportMailLimit(t.assessor.id)).rejects.toMatchObject({ status: 429 });
		// an hour later they count no more
		await tdb()('mail_outbox')
			.where({ created_by: t.assessor.id })
			.update({ created_at: tdb().raw("now() - interval '61 minutes'") });
		await expect(rl.checkReportMailLimit(t.assessor.id)).resolves.toBeUndefined();
	});
});
