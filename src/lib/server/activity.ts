import { db, type Db } from './db';

/** Append one row to the append-only activity log (the database refuses updates and deletes). */
export async function logActivity(
	entry: {
		organisationId: string | null;
		userId: string | null;
		action: string;
		entity: string;
		entityId?: string | null;
		details?: Record<string, unknown>;
	},
	trx: Db = db
): Promise<void> {
	await trx('activity_log').insert({
		organisation_id: entry.organisationId,
		user_id: entry.userId,
		action: entry.action,
		entity: entry.entity,
		entity_id: entry.entityId ?? null,
		details: JSON.stringify(entry.details ?? {})
	});
}

/** Who acts: the signed-in member (anything with their organisation and user id). */
export type ActingMember = { organisationId: string; user: { id: string } };

/**
 * The log of one kind of record: `log(member, action, entityId, details, trx)` appends what a member
 * did to a record of their organisation.
 */
export function activityLog(entity: string) {
	return (
		member: ActingMember,
		action: string,
		entityId: string,
		details: Record<string, unknown>,
		trx: Db = db
	): Promise<void> =>
		logActivity(
			{
				organisationId: member.organisationId,
				userId: member.user.id,
				action,
				entity,
				entityId,
				details
			},
			trx
		);
}
