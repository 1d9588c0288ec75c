import { db, lockRecord, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import {
	climateInputSchema,
	climateUpdateSchema,
	type ClimateInput,
	type ClimateUpdate
} from '$lib/climates/schema';
import {
	ConflictError,
	ValidationError,
	assertVersion,
	pgCode,
	PG_FOREIGN_KEY_VIOLATION,
	uniqueViolationAs
} from '$lib/server/errors';
import { fieldIssues } from '$lib/validation';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { markIssuedDwellings, usingClimate } from '$lib/server/reports/marks';

/** An organisation's climates: twelve months of external conditions with their source. */

export async function listClimates(organisationId: string): Promise<ClimateSummary[]> {
	const rows = await db('climates as c')
		.where('c.organisation_id', organisationId)
		.orderBy('c.name')
		.select(
			'c.*',
			db.raw(
				'(SELECT count(*) FROM dwellings d WHERE d.climate_id = c.id AND d.organisation_id = c.organisation_id) AS dwellings_using'
			),
			db.raw(
				'(SELECT count(*) FROM elements e WHERE e.climate_id = c.id AND e.organisation_id = c.organisation_id) AS elements_using'
			)
		);
	return rows.map((r) => ({
		...toClimate(r),
		usage: { dwellings: Number(r.dwellings_using), elements: Number(r.elements_using) }
	}));
}

export async function getClimate(organisationId: string, id: string, trx: Db = db): Promise<Climate | null> {
	const row = await trx('climates').where({ organisation_id: organisationId, id }).first();
	return row ? toClimate(row) : null;
}

/** The climate's name, source and months (the brief the dwelling and element pages show). */
export async function getClimateBrief(organisationId: string, climateId: string, trx: Db = db) {
	const climate = await getClimate(organisationId, climateId, trx);
	return climate ? toClimateBrief(climate) : null;
}

/** The brief of a climate, or of its row (the same names; also as read inside a JSON aggregate). */
export function toClimateBrief(c: Record<string, unknown>) {
	return {
		id: c.id as string,
		name: c.name as string,
		source: c.source as string,
		illustrative: Boolean(c.illustrative),
		months: c.months as ClimateMonthValues[]
	};
}

export type ClimateBrief = ReturnType<typeof toClimateBrief>;

/** How many dwellings and elements name the climate. */
export async function getClimateUsage(organisationId: string, id: string, trx: Db = db) {
	const [d] = await trx('dwellings')
		.where({ organisation_id: organisationId, climate_id: id })
		.count({ n: '*' });
	const [e] = await trx('elements')
		.where({ organisation_id: organisationId, climate_id: id })
		.count({ n: '*' });
	return { dwellings: Number(d.n), elements: Number(e.n) };
}

export async function createClimate(member: Member, input: ClimateInput, trx?: Db): Promise<Climate> {
	const data = climateInputSchema.parse(input);
	const write = async (t: Db) => {
		try {
			const [row] = await t('climates')
				.insert({
					organisation_id: member.organisationId,
					name: data.name,
					source: data.source,
					illustrative: data.illustrative,
					months: JSON.stringify(data.months)
				})
				.returning('*');
			await log(member, 'create', row.id, { name: data.name }, t);
			return toClimate(row);
		} catch (e) {
			throw nameTaken(e, data.name);
		}
	};
	return trx ? write(trx) : db.transaction(write);
}

/**
 * Replaces the climate's fields; `version` must be the one the caller loaded, else 409 with the version
 * now stored and nothing is written. Null when there is no such climate in the organisation.
 */
export async function updateClimate(
	member: Member,
	id: string,
	input: ClimateUpdate
): Promise<Climate | null> {
	const parsed = climateUpdateSchema.safeParse(input);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { version, ...data } = parsed.data;
	return db.transaction(async (t) => {
		const current = await lockRecord(t, 'climates', member.organisationId, id);
		if (!current) return null;
		assertVersion(current.version, version);
		try {
			const [row] = await t('climates')
				.where({ organisation_id: member.organisationId, id })
				.update({
					name: data.name,
					source: data.source,
					illustrative: data.illustrative,
					months: JSON.stringify(data.months),
					version: current.version + 1,
					updated_at: t.fn.now()
				})
				.returning('*');
			await log(member, 'update', id, { name: data.name, version: row.version }, t);
			if (JSON.stringify(current.months) !== JSON.stringify(data.months))
				await markIssuedDwellings(t, member.organisationId, usingClimate(id));
			return toClimate(row);
		} catch (e) {
			throw nameTaken(e, data.name);
		}
	});
}

/**
 * Deletes a climate no dwelling or element names; `version` must be the one the caller loaded (else
 * 409). Returns false when there is no such climate.
 */
export async function deleteClimate(member: Member, id: string, version: number): Promise<boolean> {
	return db.transaction(async (t) => {
		const row = await lockRecord(t, 'climates', member.organisationId, id);
		if (!row) return false;
		assertVersion(row.version, version);
		const usage = await getClimateUsage(member.organisationId, id, t);
		if (usage.dwellings + usage.elements > 0) throw inUse(row.name, usage);
		try {
			await t('climates').where({ organisation_id: member.organisationId, id }).delete();
		} catch (e) {
			if (pgCode(e) === PG_FOREIGN_KEY_VIOLATION) throw inUse(row.name, usage);
			throw e;
		}
		await log(member, 'delete', id, { name: row.name }, t);
		return true;
	});
}

function inUse(name: string, usage: { dwellings: number; elements: number }) {
	const parts = [];
	if (usage.dwellings) parts.push(`${usage.dwellings} dwelling${usage.dwellings === 1 ? '' : 's'}`);
	if (usage.elements) parts.push(`${usage.elements} element${usage.elements === 1 ? '' : 's'}`);
	return new ConflictError(
		`The climate "${name}" is used by ${parts.join(' and ') || 'a dwelling or element'}; choose another climate for them before deleting it.`
	);
}

const log = activityLog('climate');

const nameTaken = (e: unknown, name: string) =>
	uniqueViolationAs(e, new ConflictError(`A climate named "${name}" already exists; choose another name.`));

function toClimate(r: Record<string, any>): Climate {
	return {
		id: r.id,
		name: r.name,
		source: r.source,
		illustrative: r.illustrative,
		months: r.months,
		version: r.version,
		createdAt: new Date(r.created_at).toISOString(),
		updatedAt: new Date(r.updated_at).toISOString()
	};
}

export type Climate = {
	id: string;
	name: string;
	source: string;
	illustrative: boolean;
	months: ClimateMonthValues[];
	/** raised by one on every update; a save states the version it loaded */
	version: number;
	createdAt: string;
	updatedAt: string;
};
export type ClimateSummary = Climate & { usage: { dwellings: number; elements: number } };
