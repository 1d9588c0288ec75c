import { db, type Db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import type { Role } from '$lib/members/roles';
import { ValidationError } from '$lib/server/errors';

export type MembershipRow = {
	organisationId: string;
	organisationName: string;
	role: Role;
};

/** The organisation and role of a user, or null when they belong to none. */
export async function getMembershipForUser(userId: string): Promise<MembershipRow | null> {
	const row = await db('memberships as m')
		.join('organisations as o', 'o.id', 'm.organisation_id')
		.where('m.user_id', userId)
		.first('m.organisation_id', 'o.name', 'm.role');
	return row ? { organisationId: row.organisation_id, organisationName: row.name, role: row.role } : null;
}

/** Whether an address belongs to a user who is (or was invited as) a member somewhere. */
export async function isKnownAddress(email: string): Promise<boolean> {
	const row = await db('users as u')
		.join('memberships as m', 'm.user_id', 'u.id')
		.whereRaw('lower(u.email) = lower(?)', [email])
		.first('u.id');
	return Boolean(row);
}

export async function listMembers(organisationId: string) {
	const rows = await db('memberships as m')
		.join('users as u', 'u.id', 'm.user_id')
		.where('m.organisation_id', organisationId)
		.orderBy([{ column: 'm.role' }, { column: 'u.email' }])
		.select(
			'u.id',
			'u.email',
			'u.name',
			'u.registration_number',
			'u.emailVerified as email_verified',
			'm.role',
			'm.created_at'
		);
	return rows.map((r) => ({
		userId: r.id as string,
		email: r.email as string,
		name: (r.name as string | null) ?? null,
		registrationNumber: (r.registration_number as string | null) ?? null,
		role: r.role as Role,
		joined: Boolean(r.email_verified),
		since: r.created_at as Date
	}));
}

/** A refusal of a membership change, naming the form field it concerns. */
const refusal = (message: string, field: string) => new ValidationError([{ path: field, message }], message);

/**
 * Invite someone by e-mail: creates the person when new and a membership with the role. The caller sends
 * the invitation e-mail after the transaction commits. An address that already belongs to another
 * organisation is not added, and the answer (`elsewhere`) lets the caller reply exactly as for an
 * invitation, so an admin cannot learn who has an account elsewhere; the person is told instead.
 */
export async function inviteMember(
	actor: { userId: string; organisationId: string },
	input: { email: string; name?: string; role: Role },
	trx?: Db
): Promise<{ userId: string; outcome: 'invited' | 'elsewhere' }> {
	const run = async (t: Db) => {
		const email = input.email.trim().toLowerCase();
		let user = await t('users').whereRaw('lower(email) = ?', [email]).first('id');
		if (!user) {
			[user] = await t('users')
				.insert({ email, name: input.name?.trim() || null })
				.returning('id');
		}
		const existing = await t('memberships').where({ user_id: user.id }).first('organisation_id');
		if (existing && existing.organisation_id === actor.organisationId) {
			throw refusal(`${email} is already a member of this organisation.`, 'email');
		}
		if (existing) return { userId: user.id as string, outcome: 'elsewhere' as const };
		await t('memberships').insert({
			organisation_id: actor.organisationId,
			user_id: user.id,
			role: input.role,
			invited_by: actor.userId
		});
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'invite',
				entity: 'membership',
				entityId: user.id,
				details: { email, role: input.role }
			},
			t
		);
		return { userId: user.id as string, outcome: 'invited' as const };
	};
	return trx ? run(trx) : db.transaction(run);
}

/** The member's membership, locked until the transaction ends; refused when they are not a member here. */
async function lockMembership(t: Db, organisationId: string, userId: string) {
	const m = await t('memberships')
		.where({ organisation_id: organisationId, user_id: userId })
		.forUpdate()
		.first();
	if (!m) throw refusal('No such member in this organisation.', 'userId');
	return m;
}

async function assertNotLastAdmin(t: Db, organisationId: string, userId: string) {
	const admins = await t('memberships')
		.where({ organisation_id: organisationId, role: 'admin' })
		.pluck('user_id');
	if (admins.length === 1 && admins[0] === userId) {
		throw refusal('An organisation needs at least one admin: make someone else admin first.', 'role');
	}
}

export async function changeMemberRole(
	actor: { userId: string; organisationId: string },
	userId: string,
	role: Role
) {
	return db.transaction(async (t) => {
		const m = await lockMembership(t, actor.organisationId, userId);
		if (m.role === 'admin' && role !== 'admin') await assertNotLastAdmin(t, actor.organisationId, userId);
		await t('memberships').where({ id: m.id }).update({ role });
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'change-role',
				entity: 'membership',
				entityId: userId,
				details: { from: m.role, to: role }
			},
			t
		);
	});
}

export async function removeMember(actor: { userId: string; organisationId: string }, userId: string) {
	return db.transaction(async (t) => {
		const m = await lockMembership(t, actor.organisationId, userId);
		if (m.role === 'admin') await assertNotLastAdmin(t, actor.organisationId, userId);
		await t('memberships').where({ id: m.id }).delete();
		// End their open sessions so removal takes effect at once.
		await t('sessions').where({ userId }).delete();
		await logActivity(
			{
				organisationId: actor.organisationId,
				userId: actor.userId,
				action: 'remove',
				entity: 'membership',
				entityId: userId,
				details: { role: m.role }
			},
			t
		);
	});
}

/** Session lifetime and how often its expiry is pushed forward; the same values are given to Auth.js. */
export const SESSION_MAX_AGE_S = 12 * 60 * 60;
export const SESSION_UPDATE_AGE_S = 60 * 60;

/**
 * Who holds a session token, with their organisation and role, in one query (every request asks this).
 * Pushes the session's expiry forward at most once per SESSION_UPDATE_AGE_S; returns the new expiry then.
 */
export async function getSignedInMember(sessionToken: string): Promise<{
	user: { id: string; email: string; name: string | null };
	membership: MembershipRow | null;
	renewedUntil: Date | null;
} | null> {
	const row = await db('sessions as s')
		.join('users as u', 'u.id', 's.userId')
		.leftJoin('memberships as m', 'm.user_id', 'u.id')
		.leftJoin('organisations as o', 'o.id', 'm.organisation_id')
		.where('s.sessionToken', sessionToken)
		.andWhere('s.expires', '>', db.fn.now())
		.first(
			'u.id',
			'u.email',
			'u.name',
			's.expires',
			'm.organisation_id',
			'm.role',
			'o.name as organisation_name'
		);
	if (!row) return null;
	let renewedUntil: Date | null = null;
	const expires = new Date(row.expires).getTime();
	if (expires - Date.now() < (SESSION_MAX_AGE_S - SESSION_UPDATE_AGE_S) * 1000) {
		renewedUntil = new Date(Date.now() + SESSION_MAX_AGE_S * 1000);
		await db('sessions').where({ sessionToken }).update({ expires: renewedUntil });
	}
	return {
		user: { id: row.id, email: row.email, name: row.name ?? null },
		membership: row.organisation_id
			? { organisationId: row.organisation_id, organisationName: row.organisation_name, role: row.role }
			: null,
		renewedUntil
	};
}
