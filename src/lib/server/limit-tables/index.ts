import { calendarDay } from '$lib/format';
import { db, lockRecord, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import { type ElementKind } from '$lib/dwellings/kinds';
import {
	limitTableInputSchema,
	limitTableUpdateSchema,
	type LimitTableInput,
	type LimitTableUpdate
} from '$lib/limit-tables/schema';
import {
	ConflictError,
	ValidationError,
	assertVersion,
	pgCode,
	PG_FOREIGN_KEY_VIOLATION,
	uniqueViolationAs
} from '$lib/server/errors';
import { fieldIssues } from '$lib/validation';
import { markIssuedDwellings, usingLimitTable } from '$lib/server/reports/marks';

/**
 * Limit tables: maximum U by element kind, per jurisdiction or scheme. One per organisation is the
 * default (a partial unique index keeps it to one); a dwelling may name another.
 */

export async function listLimitTables(organisationId: string): Promise<LimitTableSummary[]> {
	const rows = await db('limit_tables as l')
		.where('l.organisation_id', organisationId)
		.orderBy([{ column: 'l.is_default', order: 'desc' }, { column: 'l.name' }, { column: 'l.edition' }])
		.select(
			'l.*',
			db.raw(
				'(SELECT count(*) FROM dwellings d WHERE d.limit_table_id = l.id AND d.organisation_id = l.organisation_id) AS dwellings_using'
			)
		);
	return rows.map((r) => ({ ...toLimitTable(r), usage: { dwellings: Number(r.dwellings_using) } }));
}

const tableRow = (trx: Db, organisationId: string, id: string) =>
	trx('limit_tables').where({ organisation_id: organisationId, id }).first();

const defaultRow = (trx: Db, organisationId: string) =>
	trx('limit_tables').where({ organisation_id: organisationId, is_default: true }).first();

/** The organisation's default is no longer the default (before another becomes it): an update, so its version goes up. */
const unsetDefault = (t: Db, organisationId: string) =>
	t('limit_tables')
		.where({ organisation_id: organisationId, is_default: true })
		.update({ is_default: false, version: t.raw('version + 1'), updated_at: t.fn.now() });

export async function getLimitTable(
	organisationId: string,
	id: string,
	trx: Db = db
): Promise<LimitTable | null> {
	const row = await tableRow(trx, organisationId, id);
	return row ? toLimitTable(row) : null;
}

export async function getDefaultLimitTable(organisationId: string, trx: Db = db): Promise<LimitTable | null> {
	const row = await defaultRow(trx, organisationId);
	return row ? toLimitTable(row) : null;
}

/**
 * The limit table that applies to a dwelling: its own choice, else the organisation's default (the rule
 * of `limitTableFor` in `$lib/limit-tables/rules`, read from the database).
 */
export async function getApplicableLimitTable(
	organisationId: string,
	limitTableId: string | null,
	trx: Db = db
) {
	const row = limitTableId
		? await tableRow(trx, organisationId, limitTableId)
		: await defaultRow(trx, organisationId);
	return row ? toLimitTableBrief(row, Boolean(limitTableId)) : null;
}

/**
 * A limit table row as the brief a dwelling is judged with (also as read inside a JSON aggregate);
 * `chosen`: the dwelling names it, rather than falling back to the default.
 */
export function toLimitTableBrief(r: Record<string, any>, chosen: boolean) {
	return {
		id: r.id as string,
		name: r.name as string,
		edition: r.edition as string,
		dated: calendarDay(r.dated),
		source: (r.source ?? null) as string | null,
		isDefault: Boolean(r.is_default),
		chosen,
		limits: (r.limits ?? {}) as Partial<Record<ElementKind, number>>
	};
}

export type LimitTableBrief = ReturnType<typeof toLimitTableBrief>;

/**
 * The same rule as an SQL condition, for queries that join a dwelling (`dwelling` alias) to the
 * organisation's limit tables (`table` alias).
 */
export function applicableLimitTableSql(dwelling: string, table: string): string {
	return `(CASE WHEN ${dwelling}.limit_table_id IS NULL THEN ${table}.is_default ELSE ${table}.id = ${dwelling}.limit_table_id END)`;
}

/** Creates a table; the organisation's first table becomes its default whatever `isDefault` says. */
export async function createLimitTable(
	member: Member,
	input: LimitTableInput,
	trx?: Db
): Promise<LimitTable> {
	const data = limitTableInputSchema.parse(input);
	const write = async (t: Db) => {
		const [{ n }] = await t('limit_tables')
			.where({ organisation_id: member.organisationId })
			.count({ n: '*' });
		const makeDefault = Number(n) === 0 || data.isDefault === true;
		if (makeDefault) await unsetDefault(t, member.organisationId);
		try {
			const [row] = await t('limit_tables')
				.insert({
					organisation_id: member.organisationId,
					name: data.name,
					edition: data.edition,
					dated: data.dated,
					source: data.source,
					is_default: makeDefault,
					limits: JSON.stringify(data.limits)
				})
				.returning('*');
			await log(
				member,
				'create',
				row.id,
				{ name: data.name, edition: data.edition, isDefault: makeDefault },
				t
			);
			// A new default: dwellings without a table of their own are now judged against it.
			if (makeDefault)
				await markIssuedDwellings(t, member.organisationId, (q) => q.whereNull('d.limit_table_id'));
			return toLimitTable(row);
		} catch (e) {
			throw nameTaken(e, data.name, data.edition);
		}
	};
	return trx ? write(trx) : db.transaction(write);
}

/** How many dwellings a table judges: those naming it, and (for the default) those naming none. */
export type LimitTableUsage = { named: number; byDefault: number; dwellings: number; isDefault: boolean };

export async function limitTableUsage(
	organisationId: string,
	id: string,
	trx: Db = db
): Promise<LimitTableUsage | null> {
	const row = await trx('limit_tables').where({ organisation_id: organisationId, id }).first('is_default');
	if (!row) return null;
	const [{ named, unnamed }] = await trx('dwellings')
		.where({ organisation_id: organisationId })
		.select(
			trx.raw('count(*) FILTER (WHERE limit_table_id = ?) AS named', [id]),
			trx.raw('count(*) FILTER (WHERE limit_table_id IS NULL) AS unnamed')
		);
	const byDefault = row.is_default ? Number(unnamed) : 0;
	return { named: Number(named), byDefault, dwellings: Number(named) + byDefault, isDefault: row.is_default };
}

/** One element kind whose maximum U differs between two versions of a table (null: no limit). */
export type LimitChange = { kind: ElementKind; from: number | null; to: number | null };

export function limitChanges(
	from: Partial<Record<ElementKind, number>>,
	to: Partial<Record<ElementKind, number>>
): LimitChange[] {
	const kinds = [...new Set([...Object.keys(from), ...Object.keys(to)])] as ElementKind[];
	return kinds
		.map((kind) => ({ kind, from: from[kind] ?? null, to: to[kind] ?? null }))
		.filter((c) => c.from !== c.to)
		.sort((a, b) => a.kind.localeCompare(b.kind));
}

/** The plain-language warning for changing the limits of a table dwellings are judged against. */
export function limitChangeWarning(usage: LimitTableUsage): string {
	const n = usage.dwellings;
	const who =
		n === 0
			? "It is the organisation's default: dwellings without a table of their own will be judged against the new limits."
			: `It is used by ${n} dwelling${n === 1 ? '' : 's'}${
					usage.byDefault === 0
						? ''
						: usage.named === 0
							? " as the organisation's default"
							: ` (${usage.named} by name, ${usage.byDefault} as the organisation's default)`
				}; their pass/fail will be re-evaluated against the new limits.`;
	return `${who} Issued reports keep the limits they were issued with.`;
}

/** Saving new limits on a table in use needs an explicit confirmation (`confirm: true`). */
export class LimitChangeNeedsConfirm extends ConflictError {
	constructor(
		message: string,
		readonly usage: LimitTableUsage,
		readonly changes: LimitChange[]
	) {
		super(message);
		this.name = 'LimitChangeNeedsConfirm';
	}
}

/**
 * Replaces a table's fields; `isDefault: true` makes it the default, `false` is ignored (set another
 * instead). `version` must be the one the caller loaded, else 409 with the version now stored and nothing
 * is written. Changing a limit of a table that dwellings are judged against (or of the default) is refused
 * with {@link LimitChangeNeedsConfirm} unless `confirm` is true; the log keeps the old and new limits.
 */
export async function updateLimitTable(
	member: Member,
	id: string,
	input: LimitTableUpdate,
	opts: { confirm?: boolean } = {}
): Promise<LimitTable | null> {
	const parsed = limitTableUpdateSchema.safeParse(input);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { version, ...data } = parsed.data;
	return db.transaction(async (t) => {
		const current = await lockRecord(t, 'limit_tables', member.organisationId, id);
		if (!current) return null;
		assertVersion(current.version, version);
		const previousLimits: Partial<Record<ElementKind, number>> = current.limits ?? {};
		const changes = limitChanges(previousLimits, data.limits);
		const usage = (await limitTableUsage(member.organisationId, id, t))!;
		const inUse = usage.dwellings > 0 || usage.isDefault;
		if (changes.length > 0 && inUse && opts.confirm !== true) {
			throw new LimitChangeNeedsConfirm(
				`"${current.name} (${current.edition})": ${limitChangeWarning(usage)} Confirm to save the new limits.`,
				usage,
				changes
			);
		}
		if (data.isDefault === true && !current.is_default) await unsetDefault(t, member.organisationId);
		try {
			const [row] = await t('limit_tables')
				.where({ organisation_id: member.organisationId, id })
				.update({
					name: data.name,
					edition: data.edition,
					dated: data.dated,
					source: data.source,
					is_default: current.is_default || data.isDefault === true,
					limits: JSON.stringify(data.limits),
					version: current.version + 1,
					updated_at: t.fn.now()
				})
				.returning('*');
			await log(
				member,
				'update',
				id,
				{
					name: data.name,
					edition: data.edition,
					version: current.version + 1,
					previousLimits,
					limits: data.limits,
					changes,
					dwellingsJudged: usage.dwellings,
					...(changes.length > 0 && inUse ? { confirmed: true } : {})
				},
				t
			);
			if (changes.length > 0)
				await markIssuedDwellings(t, member.organisationId, usingLimitTable(id, Boolean(row.is_default)));
			return toLimitTable(row);
		} catch (e) {
			throw nameTaken(e, data.name, data.edition);
		}
	});
}

/** Makes the table the organisation's default; returns null when there is no such table. */
export async function setDefaultLimitTable(member: Member, id: string): Promise<LimitTable | null> {
	return db.transaction(async (t) => {
		const current = await lockRecord(t, 'limit_tables', member.organisationId, id);
		if (!current) return null;
		if (current.is_default) return toLimitTable(current);
		await unsetDefault(t, member.organisationId);
		const [row] = await t('limit_tables')
			.where({ organisation_id: member.organisationId, id })
			.update({ is_default: true, version: current.version + 1, updated_at: t.fn.now() })
			.returning('*');
		await log(member, 'set-default', id, { name: row.name, edition: row.edition }, t);
		// Dwellings without a table of their own are now judged against this one.
		await markIssuedDwellings(t, member.organisationId, (q) => q.whereNull('d.limit_table_id'));
		return toLimitTable(row);
	});
}

/**
 * Deletes a table that no dwelling names; `version` must be the one the caller loaded (else 409). The
 * default is refused while other tables exist (dwellings without a table of their own are judged against
 * it): make another the default first.
 */
export async function deleteLimitTable(member: Member, id: string, version: number): Promise<boolean> {
	return db.transaction(async (t) => {
		const row = await lockRecord(t, 'limit_tables', member.organisationId, id);
		if (!row) return false;
		assertVersion(row.version, version);
		const label = `${row.name} (${row.edition})`;
		const [{ n }] = await t('dwellings')
			.where({ organisation_id: member.organisationId, limit_table_id: id })
			.count({ n: '*' });
		if (Number(n) > 0) {
			throw new ConflictError(
				`The limit table "${label}" is used by ${n} dwelling${Number(n) === 1 ? '' : 's'}; choose another table for them before deleting it.`
			);
		}
		if (row.is_default) {
			const [{ others }] = await t('limit_tables')
				.where({ organisation_id: member.organisationId })
				.whereNot({ id })
				.count({ others: '*' });
			if (Number(others) > 0) {
				throw new ConflictError(
					`"${label}" is the organisation's default limit table; make another table the default before deleting it.`
				);
			}
			const [{ d }] = await t('dwellings')
				.where({ organisation_id: member.organisationId })
				.count({ d: '*' });
			if (Number(d) > 0) {
				throw new ConflictError(
					`"${label}" is the organisation's only limit table and its dwellings are judged against it; add another table first.`
				);
			}
		}
		try {
			await t('limit_tables').where({ organisation_id: member.organisationId, id }).delete();
		} catch (e) {
			if (pgCode(e) === PG_FOREIGN_KEY_VIOLATION) {
				throw new ConflictError(`The limit table "${label}" is in use; it cannot be deleted.`);
			}
			throw e;
		}
		await log(member, 'delete', id, { name: row.name, edition: row.edition }, t);
		return true;
	});
}

/** Dwellings that name the table (not those that fall back to it as the default), first 50 by reference. */
export async function listDwellingsNamingLimitTable(organisationId: string, id: string) {
	const rows = await db('dwellings')
		.where({ organisation_id: organisationId, limit_table_id: id })
		.orderBy('reference')
		.limit(50)
		.select('id', 'reference', 'address');
	return rows.map((r) => ({
		id: r.id as string,
		reference: r.reference as string,
		address: r.address as string
	}));
}

/** The maximum U for an element kind in a table, or null when the table names none. */
export function limitFor(table: Pick<LimitTable, 'limits'> | null, kind: ElementKind): number | null {
	const v = table?.limits[kind];
	return typeof v === 'number' ? v : null;
}

const log = activityLog('limit-table');

const nameTaken = (e: unknown, name: string, edition: string) =>
	uniqueViolationAs(
		e,
		new ConflictError(
			`A limit table "${name}", edition "${edition}", already exists; change the name or edition.`
		)
	);

function toLimitTable(r: Record<string, any>): LimitTable {
	return {
		id: r.id,
		name: r.name,
		edition: r.edition,
		dated: calendarDay(r.dated),
		source: r.source ?? null,
		isDefault: r.is_default,
		limits: r.limits ?? {},
		version: r.version,
		createdAt: new Date(r.created_at).toISOString(),
		updatedAt: new Date(r.updated_at).toISOString()
	};
}

export type LimitTable = {
	id: string;
	name: string;
	edition: string;
	/** YYYY-MM-DD */
	dated: string | null;
	source: string | null;
	isDefault: boolean;
	/** maximum U in W/(m²·K) by element kind */
	limits: Partial<Record<ElementKind, number>>;
	/** raised by one on every update (making another table the default included); a save states the version it loaded */
	version: number;
	createdAt: string;
	updatedAt: string;
};
export type LimitTableSummary = LimitTable & { usage: { dwellings: number } };
