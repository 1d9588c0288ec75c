import { z } from 'zod';
import type { WindowInput } from '$lib/physics/window';
import { db, type Db } from '$lib/server/db';
import { activityLog } from '$lib/server/activity';
import type { Member } from '$lib/server/guard';
import {
	analyseElement,
	ENGINE_VERSION,
	type ElementInput,
	type ElementResult,
	type HeatFlow
} from '$lib/physics';
import { toElementInput, type StoredBuildUp, type StoredInternal } from '$lib/dwellings/element-input';
import { DEFAULT_HEAT_FLOW, type DwellingStatus, type ElementKind } from '$lib/dwellings/kinds';
import {
	elementFieldsSchema,
	isGivenU,
	validateElement,
	versionSchema,
	type ElementFields
} from '$lib/dwellings/schema';
import {
	ConflictError,
	NotFoundError,
	ValidationError,
	assertVersion,
	type FieldIssue
} from '$lib/server/errors';
import type { ElementBrief } from '$lib/dwellings/summary';
import { meetsLimit } from '$lib/limit-tables/rules';
import { getClimateBrief, type ClimateBrief } from '$lib/server/climates';
import { getApplicableLimitTable } from '$lib/server/limit-tables';
import { assertChangeable, lockDwelling, touchDwelling } from './locks';
import { fieldIssues } from '$lib/validation';
import { compareElements, type Change, type ComparedElement } from '$lib/dwellings/changes';
import { limitFor } from '$lib/server/limit-tables';

/* ------------------------------------------------------------ reads */

/** The dwelling's elements for lists: U, moisture outcome and surface check, without the full result. */
export async function listElementSummaries(
	organisationId: string,
	dwellingId: string,
	trx: Db = db
): Promise<ElementBrief[]> {
	const rows = await trx('elements')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'position' }, { column: 'created_at' }])
		.select(
			'id',
			'position',
			'name',
			'kind',
			'area',
			'heat_flow',
			'given_u',
			'engine_version',
			'version',
			'updated_at',
			// the stored result's headline figures, kept as generated columns: no result is read
			'result_u_value as u_value',
			'result_u_rounded as u_value_rounded',
			'result_moisture as moisture',
			'result_surface_pass as surface_pass'
		);
	return rows.map(toElementBrief);
}

/**
 * The summary columns of an element row (also as read inside a JSON aggregate, where timestamps arrive
 * as text): the U-value and checks come from the stored last_result, nothing is recalculated.
 */
export function toElementBrief(r: Record<string, unknown>): ElementBrief {
	const given = r.given_u !== null && r.given_u !== undefined;
	return {
		id: r.id as string,
		position: r.position as number,
		name: r.name as string,
		kind: r.kind as ElementKind,
		area: r.area as number,
		heatFlow: r.heat_flow as ElementBrief['heatFlow'],
		uValue: given ? (r.given_u as number) : ((r.u_value as number | null) ?? null),
		uValueRounded: given ? (r.given_u as number) : ((r.u_value_rounded as number | null) ?? null),
		given,
		moisture: (r.moisture as ElementBrief['moisture']) ?? null,
		surfacePass: (r.surface_pass as boolean | null) ?? null,
		engineVersion: (r.engine_version as string | null) ?? null,
		version: r.version as number,
		updatedAt: new Date(r.updated_at as string).toISOString()
	};
}

export async function getElement(organisationId: string, id: string, trx: Db = db): Promise<Element | null> {
	const row = await trx('elements').where({ organisation_id: organisationId, id }).first();
	return row ? toElement(row) : null;
}

/** Everything the element page needs: the element, its dwelling, the climate and limit that apply. */
export async function getElementContext(organisationId: string, id: string) {
	const element = await getElement(organisationId, id);
	if (!element) return null;
	return { element, ...(await getDwellingContext(organisationId, element.dwellingId, element.climateId)) };
}

/** Climate, limit table and dwelling details an element of this dwelling is computed and judged with. */
export async function getDwellingContext(
	organisationId: string,
	dwellingId: string,
	elementClimateId: string | null = null
) {
	const d = await db('dwellings').where({ organisation_id: organisationId, id: dwellingId }).first();
	if (!d) throw new NotFoundError('No such dwelling.');
	const climateId = elementClimateId ?? d.climate_id;
	const [climate, dwellingClimate, limitTable] = await Promise.all([
		climateId ? getClimateBrief(organisationId, climateId) : null,
		d.climate_id ? getClimateBrief(organisationId, d.climate_id) : null,
		getApplicableLimitTable(organisationId, d.limit_table_id)
	]);
	return {
		dwelling: {
			id: d.id as string,
			reference: d.reference as string,
			address: d.address as string,
			status: d.status as DwellingStatus,
			climateId: (d.climate_id ?? null) as string | null,
			version: d.version as number,
			reopened: Boolean(d.reopened_at)
		},
		climate,
		dwellingClimate,
		limitTable
	};
}

/* ------------------------------------------------------------ calculation */

/**
 * Validate and compute an element as entered, with the climate it names (else the dwelling's).
 * Windows and doors have no build-up: their given U is the result.
 */
export async function calculateElement(
	organisationId: string,
	raw: unknown,
	dwellingClimateId: string | null,
	trx: Db = db
): Promise<{
	data: ElementFields;
	input: ElementInput | null;
	result: ElementResult | null;
	climate: ClimateBrief | null;
}> {
	const pre = elementFieldsSchema.safeParse(raw);
	if (!pre.success) throw new ValidationError(fieldIssues(pre.error));
	const climateId = pre.data.climateId ?? dwellingClimateId;
	const climate = climateId ? await getClimateBrief(organisationId, climateId, trx) : null;
	if (pre.data.climateId && !climate) {
		throw new ValidationError([{ path: 'climateId', message: 'is not one of your organisation’s climates' }]);
	}
	const checked = validateElement(raw, climate?.months ?? null);
	if (!checked.ok) throw new ValidationError(checked.issues);
	const data = checked.data;
	data.heatFlow ??= DEFAULT_HEAT_FLOW[data.kind];
	if (isGivenU(data.kind)) return { data, input: null, result: null, climate };
	await checkMaterialLinks(organisationId, data.buildUp as StoredBuildUp, trx);
	const input = toElementInput(
		{
			heatFlow: data.heatFlow,
			buildUp: data.buildUp as StoredBuildUp,
			internal: data.internal as StoredInternal | null
		},
		climate?.months ?? null
	);
	return { data, input, result: analyseElement(input), climate };
}

/** A layer may name only the organisation's own library revisions. */
async function checkMaterialLinks(organisationId: string, buildUp: StoredBuildUp, trx: Db) {
	const wanted = buildUp.layers
		.map((l, i) => ({ i, id: l.materialRevisionId, material: l.materialId }))
		.filter((x) => x.id || x.material);
	if (!wanted.length) return;
	const revIds = [...new Set(wanted.map((w) => w.id).filter(Boolean))] as string[];
	const matIds = [...new Set(wanted.map((w) => w.material).filter(Boolean))] as string[];
	const [revs, mats] = await Promise.all([
		revIds.length
			? trx('material_revisions')
					.where('organisation_id', organisationId)
					.whereIn('id', revIds)
					.select('id', 'material_id')
			: [],
		matIds.length
			? trx('materials').where('organisation_id', organisationId).whereIn('id', matIds).select('id')
			: []
	]);
	const revMap = new Map(revs.map((r: { id: string; material_id: string }) => [r.id, r.material_id]));
	const matSet = new Set(mats.map((m: { id: string }) => m.id));
	const issues: FieldIssue[] = [];
	for (const w of wanted) {
		if (w.id && !revMap.has(w.id)) {
			issues.push({
				path: `buildUp.layers.${w.i}.materialRevisionId`,
				message: 'is not a revision in your organisation’s library'
			});
		} else if (w.material && !matSet.has(w.material)) {
			issues.push({
				path: `buildUp.layers.${w.i}.materialId`,
				message: 'is not a material in your organisation’s library'
			});
		} else if (w.id && w.material && revMap.get(w.id) !== w.material) {
			issues.push({
				path: `buildUp.layers.${w.i}.materialRevisionId`,
				message: 'belongs to another material'
			});
		}
	}
	if (issues.length) throw new ValidationError(issues);
}

/* ------------------------------------------------------------ writes */

function columns(data: ElementFields, result: ElementResult | null) {
	return {
		name: data.name,
		kind: data.kind,
		area: data.area,
		heat_flow: data.heatFlow ?? DEFAULT_HEAT_FLOW[data.kind],
		build_up: data.buildUp ? JSON.stringify(data.buildUp) : null,
		given_u: isGivenU(data.kind) ? data.givenU : null,
		given_u_source: isGivenU(data.kind) ? data.givenUSource : null,
		window_parts: isGivenU(data.kind) && data.windowParts ? JSON.stringify(data.windowParts) : null,
		climate_id: data.climateId,
		internal: data.internal ? JSON.stringify(data.internal) : null,
		last_result: result ? JSON.stringify(result) : null,
		engine_version: result ? ENGINE_VERSION : null
	};
}

/**
 * Lock an element for a change, in the order every writer takes the locks: its dwelling (which must not
 * be archived, nor accepted or awaiting review unless reopened), then the element, whose version must be the one the caller loaded.
 */
async function lockElement(t: Db, organisationId: string, id: string, version: number) {
	const existing = await t('elements').where({ organisation_id: organisationId, id }).first('dwelling_id');
	if (!existing) throw new NotFoundError('No such element.');
	const dwelling = await lockDwelling(t, organisationId, existing.dwelling_id);
	assertChangeable(dwelling);
	const current = await t('elements').where({ organisation_id: organisationId, id }).forUpdate().first();
	assertVersion(current.version, version);
	return { dwellingId: existing.dwelling_id as string, current };
}

const elementLog = activityLog('element');
const dwellingLog = activityLog('dwelling');

/** Add an element to a dwelling; the server computes and stores its result. */
export async function createElement(
	member: Member,
	dwellingId: string,
	raw: unknown,
	trx?: Db
): Promise<ElementWithVerdict> {
	const write = async (t: Db) => {
		const dwelling = await lockDwelling(t, member.organisationId, dwellingId);
		assertChangeable(dwelling);
		const d = await t('dwellings').where({ id: dwellingId }).first('climate_id', 'limit_table_id');
		const { data, result } = await calculateElement(member.organisationId, raw, d.climate_id, t);
		let position = data.position;
		if (position === undefined) {
			const [{ max }] = await t('elements').where({ dwelling_id: dwellingId }).max({ max: 'position' });
			position = max === null ? 0 : Number(max) + 1;
		}
		const [row] = await t('elements')
			.insert({
				organisation_id: member.organisationId,
				dwelling_id: dwellingId,
				position,
				...columns(data, result)
			})
			.returning('*');
		await touchDwelling(t, member.organisationId, dwellingId);
		await elementLog(
			member,
			'create',
			row.id,
			{
				dwellingId,
				name: data.name,
				kind: data.kind,
				uValue: result?.uValue ?? data.givenU ?? null
			},
			t
		);
		return withVerdict(
			toElement(row),
			await getApplicableLimitTable(member.organisationId, d.limit_table_id, t)
		);
	};
	return trx ? write(trx) : db.transaction(write);
}

/** Replace an element's fields; `version` must be the one the caller loaded, else 409 and nothing is written. */
export async function updateElement(member: Member, id: string, raw: unknown): Promise<ElementWithVerdict> {
	const v = versionSchema.safeParse((raw as { version?: unknown } | null)?.version);
	if (!v.success) throw new ValidationError([{ path: 'version', message: v.error.issues[0].message }]);
	return db.transaction(async (t) => {
		const { dwellingId, current } = await lockElement(t, member.organisationId, id, v.data);
		const d = await t('dwellings').where({ id: dwellingId }).first('climate_id', 'limit_table_id');
		const { data, result } = await calculateElement(member.organisationId, raw, d.climate_id, t);
		const [row] = await t('elements')
			.where({ organisation_id: member.organisationId, id })
			.update({
				...columns(data, result),
				position: data.position ?? current.position,
				version: current.version + 1,
				updated_at: t.fn.now()
			})
			.returning('*');
		await touchDwelling(t, member.organisationId, dwellingId);
		await elementLog(
			member,
			'update',
			id,
			{
				dwellingId,
				version: current.version + 1,
				uBefore: current.last_result?.uValue ?? current.given_u ?? null,
				uAfter: result?.uValue ?? data.givenU ?? null,
				changes: await compareElementRows(t, current, row)
			},
			t
		);
		return withVerdict(
			toElement(row),
			await getApplicableLimitTable(member.organisationId, d.limit_table_id, t)
		);
	});
}

export async function deleteElement(member: Member, id: string, version: number): Promise<void> {
	await db.transaction(async (t) => {
		const { dwellingId, current } = await lockElement(t, member.organisationId, id, version);
		await t('elements').where({ organisation_id: member.organisationId, id }).delete();
		await touchDwelling(t, member.organisationId, dwellingId);
		await elementLog(member, 'delete', id, { dwellingId, name: current.name }, t);
	});
}

/** The body of a reorder: every element id of the dwelling once, in the new order, and the dwelling's version. */
export const elementOrderSchema = z.object({
	ids: z
		.array(z.uuid({ error: 'must be the id of an element of this dwelling' }), {
			error: 'is required: every element id of the dwelling, in the new order'
		})
		.max(500, 'must list at most 500 elements'),
	version: versionSchema
});

/**
 * Put the dwelling's elements in the given order (positions 0, 1, 2 …). `ids` must name each of the
 * dwelling's elements exactly once; `version` is the dwelling's, checked and raised by one, in one
 * transaction, so two people reordering at once cannot interleave.
 */
export async function reorderElements(
	member: Member,
	dwellingId: string,
	raw: unknown
): Promise<{ version: number; ids: string[] }> {
	const parsed = elementOrderSchema.safeParse(raw);
	if (!parsed.success) throw new ValidationError(fieldIssues(parsed.error));
	const { ids, version } = parsed.data;
	return db.transaction(async (t) => {
		const dwelling = await lockDwelling(t, member.organisationId, dwellingId);
		assertChangeable(dwelling);
		assertVersion(dwelling.version, version);
		const rows: { id: string; position: number }[] = await t('elements')
			.where({ organisation_id: member.organisationId, dwelling_id: dwellingId })
			.orderBy([{ column: 'position' }, { column: 'created_at' }])
			.select('id', 'position');
		const known = new Set(rows.map((r) => r.id));
		const issues: FieldIssue[] = [];
		const seen = new Set<string>();
		ids.forEach((id, i) => {
			if (seen.has(id)) issues.push({ path: `ids.${i}`, message: 'is listed twice' });
			else if (!known.has(id))
				issues.push({ path: `ids.${i}`, message: 'is not an element of this dwelling' });
			seen.add(id);
		});
		const missing = rows.filter((r) => !seen.has(r.id)).length;
		if (missing) {
			issues.push({
				path: 'ids',
				message: `leaves out ${missing} of the dwelling’s ${rows.length} element(s): list every one once`
			});
		}
		if (issues.length) throw new ValidationError(issues);
		const before = rows.map((r) => r.id);
		if (ids.every((id, k) => rows[k].id === id && rows[k].position === k)) {
			return { version: dwelling.version, ids }; // already in this order: nothing to write
		}
		// One statement: each element's position is the index of its id in the new order.
		await t.raw(
			`UPDATE elements AS e SET position = o.ord - 1
			   FROM unnest(?::uuid[]) WITH ORDINALITY AS o(id, ord)
			  WHERE e.id = o.id AND e.organisation_id = ? AND e.dwelling_id = ?`,
			[ids, member.organisationId, dwellingId]
		);
		await t('dwellings')
			.where({ organisation_id: member.organisationId, id: dwellingId })
			.update({ version: dwelling.version + 1, updated_at: t.fn.now() });
		await dwellingLog(member, 'reorder', dwellingId, { before, after: ids }, t);
		return { version: dwelling.version + 1, ids };
	});
}

/** Duplicate an element within its dwelling (same build-up, "(copy)" added to the name). */
export async function duplicateElement(member: Member, id: string): Promise<ElementWithVerdict> {
	const el = await getElement(member.organisationId, id);
	if (!el) throw new NotFoundError('No such element.');
	return createElement(member, el.dwellingId, {
		name: `${el.name} (copy)`.slice(0, 120),
		kind: el.kind,
		area: el.area,
		heatFlow: el.heatFlow,
		buildUp: el.buildUp,
		givenU: el.givenU,
		givenUSource: el.givenUSource,
		windowParts: el.windowParts,
		climateId: el.climateId,
		internal: el.internal
	});
}

/** One stored element row as the change list compares it; `revisions` gives library revision numbers by id. */
function comparable(
	r: Record<string, any>,
	revisions: Map<string, { revision: number; code: string | null }>
): ComparedElement {
	const buildUp = (r.build_up ?? null) as StoredBuildUp | null;
	const materialRevisions = (buildUp?.layers ?? []).flatMap((l, layerIndex) => {
		const rev = l.materialRevisionId ? revisions.get(l.materialRevisionId) : undefined;
		return rev ? [{ layerIndex, ...rev }] : [];
	});
	return {
		id: r.id,
		name: r.name,
		kind: r.kind,
		area: Number(r.area),
		heatFlow: r.heat_flow,
		givenU: r.given_u ?? null,
		givenUSource: r.given_u_source ?? null,
		buildUp,
		internal: (r.internal ?? null) as StoredInternal | null,
		climate: r.climate_id ? { id: r.climate_id, name: 'another climate', months: [] } : null,
		u: (r.last_result as ElementResult | null)?.uValueRounded ?? r.given_u ?? null,
		materialRevisions
	};
}

/**
 * The field-by-field changes from one stored element row to another (before → after): one save, for
 * the activity log, or a design element against its as-built copy.
 */
export async function compareElementRows(
	t: Db,
	before: Record<string, any>,
	after: Record<string, any>
): Promise<Change[]> {
	const ids = [before, after].flatMap((r) =>
		((r.build_up as StoredBuildUp | null)?.layers ?? []).map((l) => l.materialRevisionId).filter(Boolean)
	) as string[];
	const rows = ids.length
		? await t('material_revisions as r')
				.join('materials as m', 'm.id', 'r.material_id')
				.whereIn('r.id', [...new Set(ids)])
				.select('r.id', 'r.revision', 'm.code')
		: [];
	const revisions = new Map(
		rows.map((x) => [x.id as string, { revision: Number(x.revision), code: x.code ?? null }])
	);
	const climateIds = [before.climate_id, after.climate_id].filter(Boolean) as string[];
	const climates = climateIds.length
		? await t('climates').whereIn('id', climateIds).select('id', 'name')
		: [];
	const named = (r: Record<string, any>): ComparedElement => {
		const c = comparable(r, revisions);
		const name = climates.find((x) => x.id === r.climate_id)?.name;
		return c.climate && name ? { ...c, climate: { ...c.climate, name } } : c;
	};
	return compareElements(named(before), named(after));
}

/* ------------------------------------------------------------ mapping */

export function withVerdict(
	element: Element,
	limitTable: { limits: Partial<Record<ElementKind, number>> } | null
): ElementWithVerdict {
	const limit = limitFor(limitTable, element.kind);
	const u = element.givenU ?? element.lastResult?.uValueRounded ?? null;
	return { ...element, limit, pass: meetsLimit(u, limit) };
}

function toElement(r: Record<string, unknown>): Element {
	return {
		id: r.id as string,
		dwellingId: r.dwelling_id as string,
		position: r.position as number,
		name: r.name as string,
		kind: r.kind as ElementKind,
		area: r.area as number,
		heatFlow: r.heat_flow as Element['heatFlow'],
		buildUp: (r.build_up ?? null) as StoredBuildUp | null,
		givenU: (r.given_u ?? null) as number | null,
		givenUSource: (r.given_u_source ?? null) as string | null,
		windowParts: (r.window_parts ?? null) as WindowInput | null,
		climateId: (r.climate_id ?? null) as string | null,
		internal: (r.internal ?? null) as StoredInternal | null,
		lastResult: (r.last_result ?? null) as ElementResult | null,
		engineVersion: (r.engine_version ?? null) as string | null,
		version: r.version as number,
		createdAt: new Date(r.created_at as string).toISOString(),
		updatedAt: new Date(r.updated_at as string).toISOString()
	};
}

export type Element = {
	id: string;
	dwellingId: string;
	position: number;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: HeatFlow;
	buildUp: StoredBuildUp | null;
	givenU: number | null;
	givenUSource: string | null;
	/** a window's or door's parts by ISO 10077-1, when its U was worked out from them */
	windowParts: WindowInput | null;
	climateId: string | null;
	internal: StoredInternal | null;
	lastResult: ElementResult | null;
	engineVersion: string | null;
	version: number;
	createdAt: string;
	updatedAt: string;
};
export type ElementWithVerdict = Element & { limit: number | null; pass: boolean | null };
