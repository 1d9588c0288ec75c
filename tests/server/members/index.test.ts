import { describe, it, expect, afterAll } from 'vitest';
import { hasDatabase, makeTeam, makeOrganisation, makeMember, tdb } from '../../factories';

// Server modules against a real PostgreSQL (common practice, no source: the behaviour is our own rules).
describe.skipIf(!hasDatabase)('members', async () => {
	const members = await import('../../../src/lib/server/members');
	const { requireRole } = await import('../../../src/lib/server/guard');
	const { fakeEvent } = await import('../../factories');
	afterAll(async () => {
		const { db, authPool } = await import('../../../src/lib/server/db');
		await db.destroy();
		await authPool.end();
	});

	it('invites a new person once; a second organisation is not told the address is taken', async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		const email = `new-${Date.now()}@example.test`;
		await members.inviteMember({ userId: a.admin.id, organisationId: a.org.id }, { email, role: 'assessor' });
		expect((await members.listMembers(a.org.id)).some((m) => m.email === email && !m.joined)).toBe(true);
		// Account enumeration through invitations (OWASP WSTG v4.2, WSTG-IDNT-04; identifier from memory):
		// the second organisation's admin gets the same kind of answer as for a new address.
		const second = await members.inviteMember(
			{ userId: b.admin.id, organisationId: b.org.id },
			{ email, role: 'assessor' }
		);
		expect(second.outcome).toBe('elsewhere');
		expect((await members.listMembers(b.org.id)).some((m) => m.email === email)).toBe(false);
		expect((await members.listMembers(a.org.id)).some((m) => m.email === email)).toBe(true);
		expect(await members.isKnownAddress(email.toUpperCase())).toBe(true);
		expect(await members.isKnownAddress(`nobody-${Date.now()}@example.test`)).toBe(false);
	});

	it('keeps at least one admin', async () => {
		const t = await makeTeam();
		await expect(
			members.changeMemberRole({ userId: t.admin.id, organisationId: t.org.id }, t.admin.id, 'assessor')
		).rejects.toThrow(/at least one admin/);
		await members.changeMemberRole(
			{ userId: t.admin.id, organisationId: t.org.id },
			t.assessor.id,
			'supervisor'
		);
		expect((await members.getMembershipForUser(t.assessor.id))?.role).toBe('supervisor');
	});

	it('cannot touch a member of another organisation', async () => {
		const a = await makeTeam();
		const b = await makeTeam();
		await expect(
			members.removeMember({ userId: a.admin.id, organisationId: a.org.id }, b.assessor.id)
		).rejects.toThrow(/No such member/);
		expect(await members.getMembershipForUser(b.assessor.id)).not.toBeNull();
	});

	it('removing a member ends their sessions and logs it; the log refuses changes', async () => {
		const t = await makeTeam();
		await tdb()('sessions').insert({
			userId: t.assessor.id,
			sessionToken: `tok-${t.assessor.id}`,
			expires: new Date(Date.now() + 60_000)
		});
		await members.removeMember({ userId: t.admin.id, organisationId: t.org.id }, t.assessor.id);
		expect(await tdb()('sessions').where({ userId: t.assessor.id }).first()).toBeUndefined();
		const row = await tdb()('activity_log').where({ organisation_id: t.org.id, action: 'remove' }).first();
		expect(row.entity_id).toBe(t.assessor.id);
		await expect(tdb()('activity_log').where({ id: row.id }).update({ action: 'x' })).rejects.toThrow(
			/append-only|permission denied for table activity_log/
		);
		await expect(tdb()('activity_log').where({ id: row.id }).delete()).rejects.toThrow(
			/append-only|permission denied for table activity_log/
		);
	});

	it('requireRole refuses anonymous, non-members and the wrong role', async () => {
		const org = await makeOrganisation();
		const assessor = await makeMember(org.id, 'assessor');
		expect(() => requireRole(fakeEvent(null, '/api/v1/me') as never)).toThrow();
		try {
			requireRole(fakeEvent(assessor, '/api/v1/x') as never, 'admin');
			expect.unreachable();
		} catch (e) {
			expect((e as { status: number }).status).toBe(403);
		}
		expect(requireRole(fakeEvent(assessor) as never, 'assessor').organisationId).toBe(org.id);
	});
	it('reads the signed-in member from the session token, refuses expired sessions and renews old ones', async () => {
		const t = await makeTeam();
		const fresh = `fresh-${t.assessor.id}`;
		const old = `old-${t.assessor.id}`;
		const expired = `expired-${t.assessor.id}`;
		await tdb()('sessions').insert([
			{
				userId: t.assessor.id,
				sessionToken: fresh,
				expires: new Date(Date.now() + members.SESSION_MAX_AGE_S * 1000)
			},
			{ userId: t.assessor.id, sessionToken: old, expires: new Date(Date.now() + 60_000) },
			{ userId: t.assessor.id, sessionToken: expired, expires: new Date(Date.now() - 1000) }
		]);
		const a = await members.getSignedInMember(fresh);
		expect(a?.user.id).toBe(t.assessor.id);
		expect(a?.membership).toEqual({
			organisationId: t.org.id,
			organisationName: t.org.name,
			role: 'assessor'
		});
		expect(a?.renewedUntil).toBeNull();
		const b = await members.getSignedInMember(old);
		expect(b?.renewedUntil).toBeInstanceOf(Date);
		const row = await tdb()('sessions').where({ sessionToken: old }).first();
		expect(new Date(row.expires).getTime()).toBeGreaterThan(Date.now() + 3600_000);
		expect(await members.getSignedInMember(expired)).toBeNull();
		expect(await members.getSignedInMember('no-such-token')).toBeNull();
	});
});
