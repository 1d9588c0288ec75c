import { containsPattern, db, lockRecord, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import { type ElementKind } from '$lib/dwellings/kinds';
import { templateInputSchema, templatePatchSchema, type TemplatePatch } from '$lib/templates/schema';
import { type StoredBuildUp as BuildUp } from '$lib/dwellings/element-input';
import {
	ConflictError,
	ForbiddenError,
	ValidationError,
	assertVersion,
	uniqueViolationAs
} from '$lib/server/errors';
import { fieldIssues } from '$lib/validation';

/**
 * Templates: reusable build-ups an element can start from. Any assessor or admin may save one;
 * its author or an admin may change or delete it.
 */

export async function listTemplates(
	organisationId: string,
	kind?: ElementKind | null,
	q?: string | null
): Promise<Template[]> {
	const query = db('templates as t')
		.leftJoin('users as u', 'u.id', 't.created_by')
		.where('t.organisation_id', organisationId)
		.orderBy([{ column: 't.kind' }, { column: 't.name' }])
		.select('t.*', 'u.name as created_by_name', 'u.email as created_by_email');
	if (kind) query.andWhere('t.kind', kind);
	if (q && q.trim()) {
		const like = containsPattern(q.trim());
		query.andWhere((w) => w.whereILike('t.name', like).orWhereILike('t.description', like));
	}
	return (await query).map(toTemplate);
}

export async function getTemplate(
	organisationId: string,
	id: string,
	trx: Db = db
): Promise<Template | null> {
	const row = await trx('templates as t')
		.leftJoin('users as u', 'u.id', 't.created_by')
		.where({ 't.organisation_id': organisationId, 't.id': id })
		.first('t.*', 'u.name as created_by_name', 'u.email as created_by_email');
	return row ? toTemplate(row) : null;
}

export async function createTemplate(
	member: Member,
	input: { name: string; kind: ElementKind; description?: string | null; buildUp: BuildUp | unknown },
	trx?: Db
): Promise<Template> {
	const data = templateInputSchema.parse(input);
	const write = async (t: Db) => {
		let id: string;
		try {
			const [row] = await t('templates')
				.insert({
					organisation_id: member.organisationId,
					name: data.name,
					kind: data.kind,
					description: data.description,
					build_up: JSON.stringify(data.buildUp),
					created_by: member.user.id
				})
				.returning('id');
			id = row.id;
		} catch (e) {
			throw nameTaken(e, data.name);
		}
		await log(
			member,
			'create',
			id,
			{ name: data.name, kind: data.kind, layers: data.buildUp.layers.length },
			t
		);
		return (await getTemplate(member.organisationId, id, t))!;
	};
	return trx ? write(trx) : db.transaction(write);
}

/** Whether the member may change or delete the template: an admin, or the assessor who saved it. */
export function canEditTemplate(
	member: Pick<Member, 'role' | 'user'>,
	template: Pick<Template, 'createdBy'>
): boolean {
	return member.role === 'admin' || (member.role === 'assessor' && template.createdBy?.id === member.user.id);
}

const NOT_YOURS = 'Only an admin or the person who saved this template can change or delete it.';

/**
 * Changes some fields; `version` must be the one the caller loaded, else 409 with the version now stored
 * and nothing is written. Null when there is no such template in the organisation.
 */
export async function updateTemplate(
	member: Member,
	id: string,
	patch: TemplatePatch
): Promise<Template | null> {
	const parsed = templatePatchSchema.safeParse(patch);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { version, ...data } = parsed.data;
	return db.transaction(async (t) => {
		const locked = await lockRecord(t, 'templates', member.organisationId, id);
		if (!locked) return null;
		const current = (await getTemplate(member.organisationId, id, t))!;
		if (!canEditTemplate(member, current)) throw new ForbiddenError(NOT_YOURS);
		assertVersion(locked.version, version);
		const changes: Record<string, unknown> = { version: locked.version + 1, updated_at: t.fn.now() };
		if (data.name !== undefined) changes.name = data.name;
		if (data.kind !== undefined) changes.kind = data.kind;
		if (data.description !== undefined) changes.description = data.description;
		if (data.buildUp !== undefined) changes.build_up = JSON.stringify(data.buildUp);
		try {
			await t('templates').where({ organisation_id: member.organisationId, id }).update(changes);
		} catch (e) {
			throw nameTaken(e, data.name ?? current.name);
		}
		await log(member, 'update', id, { fields: Object.keys(data), version: locked.version + 1 }, t);
		return getTemplate(member.organisationId, id, t);
	});
}

/** Deletes the template; `version` must be the one the caller loaded (else 409). False when there is none. */
export async function deleteTemplate(member: Member, id: string, version: number): Promise<boolean> {
	return db.transaction(async (t) => {
		const locked = await lockRecord(t, 'templates', member.organisationId, id);
		if (!locked) return false;
		const current = (await getTemplate(member.organisationId, id, t))!;
		if (!canEditTemplate(member, current)) throw new ForbiddenError(NOT_YOURS);
		assertVersion(locked.version, version);
		await t('templates').where({ organisation_id: member.organisationId, id }).delete();
		await log(member, 'delete', id, { name: current.name, kind: current.kind }, t);
		return true;
	});
}

const log = activityLog('template');

const nameTaken = (e: unknown, name: string) =>
	uniqueViolationAs(e, new ConflictError(`A template named "${name}" already exists; choose another name.`));

function toTemplate(r: Record<string, any>): Template {
	return {
		id: r.id,
		name: r.name,
		kind: r.kind,
		description: r.description ?? null,
		buildUp: r.build_up,
		version: r.version,
		createdBy: r.created_by
			? { id: r.created_by, name: r.created_by_name ?? r.created_by_email ?? null }
			: null,
		createdAt: new Date(r.created_at).toISOString(),
		updatedAt: new Date(r.updated_at).toISOString()
	};
}

export type Template = {
	id: string;
	name: string;
	kind: ElementKind;
	description: string | null;
	buildUp: BuildUp;
	/** raised by one on every update; a save states the version it loaded */
	version: number;
	createdBy: { id: string; name: string | null } | null;
	createdAt: string;
	updatedAt: string;
};
