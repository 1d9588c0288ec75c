/**
 * Junctions of a dwelling: reads, writes (in a transaction, with the dwelling locked and refused when
 * it may not change, a version check, and the activity log), and the server's own calculation, which
 * is the authority: on every save it builds the model again from the dwelling's stored elements (or
 * takes the free-form model), computes it and stores the result.
 */
import { db, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import { NotFoundError, ValidationError, assertVersion } from '$lib/server/errors';
import { assertChangeable, lockDwelling, touchDwelling } from '$lib/server/dwellings/locks';
import { getClimateBrief } from '$lib/server/climates';
import { fieldIssues } from '$lib/validation';
import { ENGINE_VERSION } from '$lib/physics';
import type { JunctionInput } from '$lib/physics/junction-schema';
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import type { HeatFlow } from '$lib/physics';
import {
	junctionFieldsSchema,
	junctionUpdateSchema,
	versionSchema,
	type JunctionDetails,
	type JunctionFields
} from '$lib/junctions/schema';
import type { DimensionSystem, JunctionType, PsiSource } from '$lib/junctions/kinds';
import { runJunction, type ElementLike } from '$lib/junctions/run';
import type { JunctionCalculation } from '$lib/junctions/calculate';
import { sumJunctions, type JunctionBrief, type JunctionTotals } from '$lib/junctions/totals';

const log = activityLog('junction');

/* ------------------------------------------------------------ reads */

/** The dwelling's junctions for lists and the heat-loss summary: ψ used, fRsi and its check, without the full result. */
export async function listJunctions(
	organisationId: string,
	dwellingId: string,
	trx: Db = db
): Promise<JunctionBrief[]> {
	const rows = await trx('junctions')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'created_at' }, { column: 'id' }])
		.select(
			'id',
			'name',
			'type',
			'length_m',
			'source',
			'dimension_system',
			'psi_entered',
			'psi_source',
			'engine_version',
			'version',
			'updated_at',
			trx.raw(`(last_result->>'psi')::float8 AS psi_calculated`),
			trx.raw(`(last_result->'surface'->>'fRsi')::float8 AS f_rsi`),
			trx.raw(`(last_result->'surface'->'critical'->>'pass')::boolean AS surface_pass`)
		);
	return rows.map(toBrief);
}

function toBrief(r: Record<string, unknown>): JunctionBrief {
	const entered = r.source === 'entered';
	return {
		id: r.id as string,
		name: r.name as string,
		type: r.type as JunctionType,
		lengthM: r.length_m as number,
		source: r.source as PsiSource,
		dimensionSystem: r.dimension_system as DimensionSystem,
		psi: entered ? (r.psi_entered as number) : ((r.psi_calculated as number | null) ?? null),
		psiSource: (r.psi_source as string | null) ?? null,
		fRsi: entered ? null : ((r.f_rsi as number | null) ?? null),
		surfacePass: entered ? null : ((r.surface_pass as boolean | null) ?? null),
		engineVersion: (r.engine_version as string | null) ?? null,
		version: r.version as number,
		updatedAt: new Date(r.updated_at as string).toISOString()
	};
}

/** Σ ψ·L of the dwelling's junctions (W/K), with the list it sums (ISO 13789: H_T = Σ U·A + Σ ψ·L). */
export async function junctionTotals(
	organisationId: string,
	dwellingId: string
): Promise<JunctionTotals & { items: JunctionBrief[] }> {
	const items = await listJunctions(organisationId, dwellingId);
	return { ...sumJunctions(items), items };
}

export async function getJunction(
	organisationId: string,
	id: string,
	trx: Db = db
): Promise<Junction | null> {
	const row = await trx('junctions').where({ organisation_id: organisationId, id }).first();
	return row ? toJunction(row) : null;
}

/** The dwelling's elements as the builder reads them, and its climate's months. */
export async function getJunctionInputs(organisationId: string, dwellingId: string, trx: Db = db) {
	const d = await trx('dwellings')
		.where({ organisation_id: organisationId, id: dwellingId })
		.first('climate_id');
	if (!d) throw new NotFoundError('No such dwelling.');
	const [rows, climate] = await Promise.all([
		trx('elements')
			.where({ organisation_id: organisationId, dwelling_id: dwellingId })
			.orderBy([{ column: 'position' }, { column: 'created_at' }])
			.select('id', 'name', 'kind', 'heat_flow', 'build_up', 'given_u', 'internal', 'version'),
		d.climate_id ? getClimateBrief(organisationId, d.climate_id, trx) : null
	]);
	const elements = rows.map((r): ElementLike & { internal: unknown } => ({
		id: r.id,
		name: r.name,
		kind: r.kind,
		heatFlow: r.heat_flow as HeatFlow,
		buildUp: (r.build_up ?? null) as StoredBuildUp | null,
		givenU: (r.given_u ?? null) as number | null,
		internal: r.internal ?? null,
		version: r.version
	}));
	return { elements, climate };
}

/* ------------------------------------------------------------ calculation */

/**
 * Validate a junction's fields and compute it as the server does on save: entered ψ as given; a
 * calculated one built from the dwelling's elements (or taken as entered, free-form) and computed
 * with the dwelling's climate. 400 naming the field when anything is at fault.
 */
export async function prepareJunction(
	organisationId: string,
	dwellingId: string,
	data: JunctionFields,
	trx: Db = db
): Promise<{ model: JunctionInput | null; result: JunctionCalculation | null }> {
	if (data.source === 'entered') return { model: null, result: null };
	const { elements, climate } = await getJunctionInputs(organisationId, dwellingId, trx);
	const run = runJunction({
		type: data.type,
		dimensionSystem: data.dimensionSystem,
		details: data.details as JunctionDetails,
		model: data.model,
		elements,
		months: climate?.months ?? null
	});
	if (!run.ok) throw new ValidationError(run.issues, issuesMessage(run.issues));
	return { model: run.model, result: run.result };
}

const issuesMessage = (issues: { path: string; message: string }[]) =>
	`The junction cannot be calculated: ${issues
		.slice(0, 3)
		.map((i) => `${i.path}: ${i.message}`)
		.join('; ')}${issues.length > 3 ? '; …' : ''}`;

function parse<T extends typeof junctionFieldsSchema | typeof junctionUpdateSchema>(schema: T, raw: unknown) {
	const r = schema.safeParse(raw);
	if (!r.success) throw new ValidationError(fieldIssues(r.error));
	return r.data;
}

function columns(data: JunctionFields, model: JunctionInput | null, result: JunctionCalculation | null) {
	const entered = data.source === 'entered';
	return {
		name: data.name,
		type: data.type,
		length_m: data.lengthM,
		source: data.source,
		dimension_system: data.dimensionSystem,
		psi_entered: entered ? data.psiEntered : null,
		psi_source: entered ? data.psiSource : null,
		model: model ? JSON.stringify(model) : null,
		details: !entered && data.details ? JSON.stringify(data.details) : null,
		last_result: result ? JSON.stringify(result) : null,
		engine_version: result ? ENGINE_VERSION : null
	};
}

const summaryOf = (data: JunctionFields, result: JunctionCalculation | null) => ({
	name: data.name,
	type: data.type,
	lengthM: data.lengthM,
	source: data.source,
	dimensionSystem: data.dimensionSystem,
	psi: data.source === 'entered' ? data.psiEntered : (result?.psi ?? null),
	...(data.source === 'entered' ? { psiSource: data.psiSource } : { fRsi: result?.surface.fRsi ?? null })
});

/* ------------------------------------------------------------ writes */

/** Add a junction to a dwelling; the server builds, computes and stores its result. */
export async function createJunction(
	member: Member,
	dwellingId: string,
	raw: unknown,
	trx?: Db
): Promise<Junction> {
	const data = parse(junctionFieldsSchema, raw);
	const write = async (t: Db) => {
		const dwelling = await lockDwelling(t, member.organisationId, dwellingId);
		assertChangeable(dwelling);
		const { model, result } = await prepareJunction(member.organisationId, dwellingId, data, t);
		const [row] = await t('junctions')
			.insert({
				organisation_id: member.organisationId,
				dwelling_id: dwellingId,
				...columns(data, model, result)
			})
			.returning('*');
		await touchDwelling(t, member.organisationId, dwellingId);
		await log(member, 'create', row.id, { dwellingId, ...summaryOf(data, result) }, t);
		return toJunction(row);
	};
	return trx ? write(trx) : db.transaction(write);
}

/**
 * Lock a junction for a change in the order every writer takes the locks: its dwelling (which must
 * be changeable), then the junction, whose version must be the one the caller loaded.
 */
async function lockJunction(t: Db, organisationId: string, id: string, version: number) {
	const existing = await t('junctions').where({ organisation_id: organisationId, id }).first('dwelling_id');
	if (!existing) throw new NotFoundError('No such junction.');
	const dwelling = await lockDwelling(t, organisationId, existing.dwelling_id);
	assertChangeable(dwelling);
	const current = await t('junctions').where({ organisation_id: organisationId, id }).forUpdate().first();
	assertVersion(current.version, version);
	return { dwellingId: existing.dwelling_id as string, current };
}

/** Replace a junction's fields; `version` must be the one the caller loaded, else 409 and nothing is written. */
export async function updateJunction(member: Member, id: string, raw: unknown): Promise<Junction> {
	const v = versionSchema.safeParse((raw as { version?: unknown } | null)?.version);
	if (!v.success) throw new ValidationError([{ path: 'version', message: v.error.issues[0].message }]);
	const data = parse(junctionUpdateSchema, raw);
	return db.transaction(async (t) => {
		const { dwellingId, current } = await lockJunction(t, member.organisationId, id, v.data);
		const { model, result } = await prepareJunction(member.organisationId, dwellingId, data, t);
		const [row] = await t('junctions')
			.where({ organisation_id: member.organisationId, id })
			.update({ ...columns(data, model, result), version: current.version + 1, updated_at: t.fn.now() })
			.returning('*');
		await touchDwelling(t, member.organisationId, dwellingId);
		const psiBefore = current.source === 'entered' ? current.psi_entered : (current.last_result?.psi ?? null);
		await log(
			member,
			'update',
			id,
			{ dwellingId, version: current.version + 1, psiBefore, ...summaryOf(data, result) },
			t
		);
		return toJunction(row);
	});
}

/**
 * Compute a stored junction again from its stored choices and the dwelling's elements as they are now
 * (a changed element changes the model), and store the result; `version` as for an update.
 */
export async function recalculateJunction(member: Member, id: string, version: number): Promise<Junction> {
	const existing = await getJunction(member.organisationId, id);
	if (!existing) throw new NotFoundError('No such junction.');
	return updateJunction(member, id, { ...fieldsOf(existing), version });
}

/** A stored junction as the fields a save sends. */
export function fieldsOf(j: Junction): Record<string, unknown> {
	return {
		name: j.name,
		type: j.type,
		lengthM: j.lengthM,
		source: j.source,
		dimensionSystem: j.dimensionSystem,
		psiEntered: j.psiEntered,
		psiSource: j.psiSource,
		model: j.details?.mode === 'free-form' ? j.model : undefined,
		details: j.details
	};
}

export async function deleteJunction(member: Member, id: string, version: number): Promise<void> {
	await db.transaction(async (t) => {
		const { dwellingId, current } = await lockJunction(t, member.organisationId, id, version);
		await t('junctions').where({ organisation_id: member.organisationId, id }).delete();
		await touchDwelling(t, member.organisationId, dwellingId);
		await log(member, 'delete', id, { dwellingId, name: current.name }, t);
	});
}

/* ------------------------------------------------------------ mapping */

function toJunction(r: Record<string, unknown>): Junction {
	return {
		id: r.id as string,
		dwellingId: r.dwelling_id as string,
		name: r.name as string,
		type: r.type as JunctionType,
		lengthM: r.length_m as number,
		source: r.source as PsiSource,
		dimensionSystem: r.dimension_system as DimensionSystem,
		psiEntered: (r.psi_entered ?? null) as number | null,
		psiSource: (r.psi_source ?? null) as string | null,
		model: (r.model ?? null) as JunctionInput | null,
		details: (r.details ?? null) as JunctionDetails | null,
		lastResult: (r.last_result ?? null) as JunctionCalculation | null,
		engineVersion: (r.engine_version ?? null) as string | null,
		version: r.version as number,
		createdAt: new Date(r.created_at as string).toISOString(),
		updatedAt: new Date(r.updated_at as string).toISOString()
	};
}

export type Junction = {
	id: string;
	dwellingId: string;
	name: string;
	type: JunctionType;
	lengthM: number;
	source: PsiSource;
	dimensionSystem: DimensionSystem;
	psiEntered: number | null;
	psiSource: string | null;
	/** the model computed (built from the elements, or free-form) */
	model: JunctionInput | null;
	details: JunctionDetails | null;
	lastResult: JunctionCalculation | null;
	engineVersion: string | null;
	version: number;
	createdAt: string;
	updatedAt: string;
};
