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

export async function listActivity(
	organisationId: string,
	filter: { entity?: string; entityId?: string; limit?: number } = {}
) {
	const q = db('activity_log as a')
		.leftJoin('users as u', 'u.id', 'a.user_id')
		.where('a.organisation_id', organisationId)
		.orderBy('a.id', 'desc')
		.limit(filter.limit ?? 100)
		.select('a.*', 'u.email as user_email', 'u.name as user_name');
	if (filter.entity) q.andWhere('a.entity', filter.entity);
	if (filter.entityId) q.andWhere('a.entity_id', filter.entityId);
	return q;
}
