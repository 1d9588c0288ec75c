/**
 * Reports: draft previews, issuing (a frozen snapshot, its PDF, SHA-256 and a verification code, in
 * the immutable `reports` table), revisions that supersede earlier ones, e-mail to the client through
 * the outbox, and the public verification of a code or a PDF.
 */
import { checkWindowParts } from '$lib/dwellings/window-parts';
import { createHash, randomInt } from 'node:crypto';
import { db, type Db } from '$lib/server/db';
import { logActivity } from '$lib/server/activity';
import { ConflictError, ForbiddenError, NotFoundError, ValidationError } from '$lib/server/errors';
import { enqueueMail, kickOutbox } from '$lib/server/outbox';
import { escapeHtml } from '$lib/server/mail';
import {
	analyseElement,
	parseElementInput,
	ENGINE_VERSION,
	type ElementResult,
	type ElementInput
} from '$lib/physics';
import { toElementInput, type StoredBuildUp, type StoredInternal } from '$lib/dwellings/element-input';
import { GIVEN_U_KINDS, ELEMENT_KIND_LABELS, type ElementKind } from '$lib/dwellings/kinds';
import { reportDocument, passWord, moistureWord, TONE_COLOURS } from './document';
import { clientSummary, TONE_WORDS, type Finding } from '$lib/reports/client-summary';
import { renderPdf } from '$lib/server/pdf';
import { groupCode, longDate } from '$lib/format';
import { supersededMailRefusal } from '$lib/reports/rules';
import { issueRefusal } from '$lib/dwellings/rules';
import type { Role } from '$lib/members/roles';
import { meetsLimit } from '$lib/limit-tables/rules';
import { getApplicableLimitTable } from '$lib/server/limit-tables';
import type {
	ReportScope,
	ReportSnapshot,
	SnapshotClimate,
	SnapshotElement,
	SnapshotLimitTable,
	SnapshotMaterialRevision
} from './snapshot';
import { evidenceForReport } from '$lib/server/evidence';
import { snapshotJunctions, type JunctionMode } from './junctions';
import type { ClimateRow, DwellingRow, ElementRow, UserRow } from '$lib/server/tables';

export type { ReportSnapshot, ReportScope } from './snapshot';

/** The problems that stop a report, as field issues of the dwelling. */
const asIssues = (problems: string[]) => problems.map((message) => ({ path: 'dwelling', message }));

type Caller = { userId: string; organisationId: string };

/* ------------------------------------------------------------------ snapshot */

async function getDwellingRow(
	organisationId: string,
	dwellingId: string,
	trx: Db = db,
	/** lock the row until the transaction ends (issuing: its assessor cannot change meanwhile) */
	lock = false
): Promise<DwellingRow> {
	const q = trx<DwellingRow>('dwellings').where({ id: dwellingId, organisation_id: organisationId });
	if (lock) q.forUpdate();
	const row = await q.first();
	if (!row) throw new NotFoundError('No such dwelling.');
	return row;
}

/** Initials of the organisation's name, the prefix of its report numbers (e.g. NRP-2026-0007). */
export function numberPrefix(organisationName: string): string {
	const words = organisationName
		.normalize('NFKD')
		.replace(/[^A-Za-z0-9 ]/g, ' ')
		.split(/\s+/)
		.filter(Boolean);
	const initials = words
		.map((w) => w[0])
		.join('')
		.toUpperCase()
		.slice(0, 4);
	return initials || 'R';
}

/** Verification codes: 10 characters of Crockford's base-32 alphabet (no I, L, O, U): 50 bits. */
const CODE_ALPHABET = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';
export function newVerificationCode(): string {
	let s = '';
	for (let i = 0; i < 10; i++) s += CODE_ALPHABET[randomInt(CODE_ALPHABET.length)];
	return s;
}
/** A code as typed by a person: case, spaces and dashes ignored, O read as 0 and I or L as 1. */
export function normaliseCode(raw: string): string {
	return raw.toUpperCase().replace(/[\s-]/g, '').replace(/O/g, '0').replace(/[IL]/g, '1');
}

export function verifyUrlFor(origin: string, code: string): string {
	return `${origin.replace(/\/$/, '')}/verify/${code}`;
}

type DocumentMeta = ReportSnapshot['document'];

/**
 * Everything the report needs, read in one go under the caller's organisation and recomputed with
 * today's engine from the stored build-ups. `problems` names each element that cannot be reported.
 * The issuer (`document.issuedBy.id`) is read here too: their name and registration number as they are
 * now are frozen into the snapshot, and the declaration prints them. A dwelling report also freezes the
 * dwelling's junctions, computed again from their stored choices (`junctions: 'calculate'`, the
 * default) or taken as last saved (`'stored'`, for comparisons, which never solve a junction), or, for
 * a page listing what stops an issue, computed only where the saved result may be out of date
 * (`'check'`).
 */
export async function buildSnapshot(
	organisationId: string,
	dwellingId: string,
	elementId: string | null,
	document: DocumentMeta,
	issuedAt: string,
	trx: Db = db,
	options: { junctions?: JunctionMode } = {}
): Promise<{ snapshot: ReportSnapshot; problems: string[] }> {
	const d = await getDwellingRow(organisationId, dwellingId, trx);
	const org = await trx('organisations').where({ id: organisationId }).first('id', 'name');
	const assessor = await readMember(trx, organisationId, d.assessor_id);
	const issuer = await readMember(trx, organisationId, document.issuedBy.id);
	const elements = await readElementRows(trx, organisationId, dwellingId, elementId);

	const problems: string[] = [];
	if (elements.length === 0)
		problems.push('The dwelling has no elements yet: add at least one before issuing.');

	const lt = await getApplicableLimitTable(organisationId, d.limit_table_id, trx);
	const limitTable: SnapshotLimitTable | null = lt
		? { id: lt.id, name: lt.name, edition: lt.edition, dated: lt.dated, source: lt.source, limits: lt.limits }
		: null;
	const context: ElementContext = {
		dwellingClimateId: d.climate_id,
		limitTable,
		climates: await readClimates(trx, organisationId, elements, d.climate_id),
		revisions: await readLayerRevisions(trx, organisationId, elements)
	};
	const snapshotElements = elements.map((e) => snapshotElement(e, context, problems));
	// junctions are the dwelling's: computed with its climate, from all its elements (a dwelling report has them all)
	const junctions =
		elementId === null
			? await snapshotJunctions(
					trx,
					organisationId,
					dwellingId,
					elements,
					d.climate_id ? (context.climates.get(d.climate_id)?.months ?? null) : null,
					options.junctions ?? 'calculate',
					problems
				)
			: undefined;
	const snapshot: ReportSnapshot = {
		dwelling: snapshotDwelling(d, assessor),
		organisation: { id: organisationId, name: org?.name ?? '' },
		limitTable,
		elements: snapshotElements,
		// every report of the dwelling lists all its evidence (and issuing it keeps them: a trigger)
		evidence: await evidenceForReport(trx, organisationId, dwellingId),
		...(junctions ? { junctions } : {}),
		engineVersion: ENGINE_VERSION,
		issuedAt,
		document: {
			...document,
			issuedBy: {
				id: document.issuedBy.id,
				name: issuer ? (issuer.name ?? issuer.email) : document.issuedBy.name,
				registrationNumber: issuer?.registration_number ?? null
			}
		}
	};
	return { snapshot, problems };
}

type Row = Record<string, any>; // joined rows as Knex returns them; converted below

/** A person of the report (the dwelling's assessor, the issuer), if they are (still) a member of the organisation. */
async function readMember(trx: Db, organisationId: string, userId: string | null) {
	if (!userId) return null;
	return (
		(await trx('users as u')
			.join('memberships as m', 'm.user_id', 'u.id')
			.where({ 'u.id': userId, 'm.organisation_id': organisationId })
			.first('u.id', 'u.name', 'u.email', 'u.registration_number')) ?? null
	);
}

/** The dwelling's elements in their order, or the one element (404 when it is not the dwelling's). */
async function readElementRows(
	trx: Db,
	organisationId: string,
	dwellingId: string,
	elementId: string | null
) {
	const q = trx('elements')
		.where({ organisation_id: organisationId, dwelling_id: dwellingId })
		.orderBy([{ column: 'position' }, { column: 'created_at' }, { column: 'id' }]);
	if (elementId) q.andWhere({ id: elementId });
	const rows: ElementRow[] = await q.select('*');
	if (elementId && rows.length === 0) throw new NotFoundError('No such element in this dwelling.');
	return rows;
}

/**
 * The climates the elements use (their own, else the dwelling's) and the dwelling's own (its junctions
 * use it), months in calendar order.
 */
async function readClimates(
	trx: Db,
	organisationId: string,
	elements: ElementRow[],
	dwellingClimateId: string | null
) {
	const ids = [
		...new Set([...elements.map((e) => e.climate_id ?? dwellingClimateId), dwellingClimateId].filter(Boolean))
	] as string[];
	const climates = new Map<string, SnapshotClimate>();
	if (!ids.length) return climates;
	const rows = await trx<ClimateRow>('climates')
		.where({ organisation_id: organisationId })
		.whereIn('id', ids)
		.select('*');
	for (const c of rows) {
		climates.set(c.id, {
			id: c.id,
			name: c.name,
			source: c.source,
			illustrative: c.illustrative,
			months: [...c.months].sort((a, b) => a.month - b.month)
		});
	}
	return climates;
}

/** The library revisions the layers point at, by revision id. */
async function readLayerRevisions(trx: Db, organisationId: string, elements: ElementRow[]) {
	const ids = new Set<string>();
	for (const e of elements) {
		for (const l of e.build_up?.layers ?? []) {
			if (l.materialRevisionId) ids.add(l.materialRevisionId);
		}
	}
	const revisions = new Map<string, Row>();
	if (!ids.size) return revisions;
	const rows = await trx('material_revisions as r')
		.join('materials as m', 'm.id', 'r.material_id')
		.where('r.organisation_id', organisationId)
		.whereIn('r.id', [...ids])
		.select(
			'r.id',
			'r.material_id',
			'r.revision',
			'r.name',
			'r.manufacturer',
			'r.lambda_kind',
			'r.source',
			'm.code'
		);
	for (const r of rows) revisions.set(r.id, r);
	return revisions;
}

function snapshotDwelling(d: DwellingRow, assessor: UserRow | null): ReportSnapshot['dwelling'] {
	return {
		id: d.id,
		reference: d.reference,
		address: d.address ?? '',
		programme: d.programme ?? null,
		stage: d.stage,
		clientName: d.client_name ?? null,
		clientEmail: d.client_email ?? null,
		assessor: assessor
			? {
					id: assessor.id,
					name: assessor.name ?? assessor.email,
					email: assessor.email,
					registrationNumber: assessor.registration_number ?? null
				}
			: null
	};
}

type ElementContext = {
	dwellingClimateId: string | null;
	limitTable: SnapshotLimitTable | null;
	climates: Map<string, SnapshotClimate>;
	revisions: Map<string, Row>;
};

/** The library revision behind each layer, as printed; a revision outside the organisation is a problem. */
function layerRevisions(
	buildUp: StoredBuildUp | null,
	revisions: Map<string, Row>,
	label: string,
	problems: string[]
) {
	const out: SnapshotMaterialRevision[] = [];
	(buildUp?.layers ?? []).forEach((l, i) => {
		if (!l.materialRevisionId) return;
		const r = revisions.get(l.materialRevisionId);
		if (!r) {
			problems.push(`${label}, layer ${i + 1}: its library revision is not in this organisation's library.`);
			return;
		}
		out.push({
			layerIndex: i,
			materialId: String(r.material_id),
			revisionId: String(r.id),
			revision: Number(r.revision),
			code: (r.code as string) ?? null,
			name: (r.name as string) ?? null,
			manufacturer: (r.manufacturer as string) ?? null,
			lambdaKind: (r.lambda_kind as string) ?? null,
			source: (r.source as string) ?? null
		});
	});
	return out;
}

/**
 * One element as the report prints it: a given U (windows, doors) or its build-up recomputed with
 * today's engine, judged against the limit for its kind. What stops it being reported goes to `problems`.
 */
function snapshotElement(e: ElementRow, ctx: ElementContext, problems: string[]): SnapshotElement {
	const kind = e.kind;
	const label = `Element "${e.name}"`;
	const buildUp = e.build_up;
	const internal = e.internal;
	const climateId = e.climate_id ?? ctx.dwellingClimateId;
	const climate = climateId ? (ctx.climates.get(climateId) ?? null) : null;
	const limit = ctx.limitTable?.limits?.[kind];
	const limitValue = typeof limit === 'number' ? limit : null;
	const base = {
		id: e.id,
		name: e.name,
		kind,
		area: e.area,
		heatFlow: e.heat_flow,
		givenU: e.given_u,
		givenUSource: e.given_u_source,
		buildUp,
		internal,
		climate,
		materialRevisions: layerRevisions(buildUp, ctx.revisions, label, problems)
	};
	const usesGiven = GIVEN_U_KINDS.includes(kind) || (!buildUp?.layers?.length && e.given_u != null);
	if (usesGiven) {
		if (e.given_u == null || !Number.isFinite(e.given_u) || e.given_u <= 0) {
			problems.push(`${label} (${ELEMENT_KIND_LABELS[kind] ?? kind}): no given U-value is recorded.`);
		}
		const u = e.given_u;
		// a U worked out from its parts: the parts and their calculation go into the record
		const windowParts = e.window_parts ? frozenWindowParts(e.window_parts, kind, u, label, problems) : null;
		return {
			...base,
			...(windowParts ? { windowParts } : {}),
			input: null,
			result: null,
			u,
			limit: limitValue,
			pass: meetsLimit(u, limitValue)
		};
	}
	if (!buildUp?.layers?.length) {
		problems.push(`${label}: no build-up is recorded.`);
		return { ...base, input: null, result: null, u: null, limit: limitValue, pass: null };
	}
	const { input, result } = recompute(e, buildUp, internal, climate, label, problems);
	const u = result ? result.uValueRounded : null;
	return { ...base, input, result, u, limit: limitValue, pass: meetsLimit(u, limitValue) };
}

/**
 * A window's or door's stored parts with their ISO 10077-1 result, as the report freezes them; parts
 * that no longer give the stored U go to `problems` (the same rule as the element's save).
 */
function frozenWindowParts(
	raw: unknown,
	kind: ElementKind,
	givenU: number | null,
	label: string,
	problems: string[]
): SnapshotElement['windowParts'] {
	if (kind !== 'window' && kind !== 'door') return undefined;
	const checked = checkWindowParts(raw, kind, givenU);
	if (!checked.ok) {
		problems.push(`${label}: ${checked.issues.map((i) => `${i.path} ${i.message}`).join('; ')}.`);
		return undefined;
	}
	return { input: checked.parts, result: checked.result };
}

/** The element's engine input and result from its stored build-up; failures go to `problems`. */
function recompute(
	e: Row,
	buildUp: StoredBuildUp,
	internal: StoredInternal | null,
	climate: SnapshotClimate | null,
	label: string,
	problems: string[]
): { input: ElementInput | null; result: ElementResult | null } {
	const parsed = parseElementInput(
		toElementInput({ heatFlow: e.heat_flow, buildUp, internal }, climate?.months ?? null)
	);
	if (!parsed.ok) {
		for (const issue of parsed.issues) problems.push(`${label}: ${issue.path}: ${issue.message}.`);
		return { input: null, result: null };
	}
	try {
		return { input: parsed.data, result: analyseElement(parsed.data) };
	} catch (err) {
		problems.push(`${label}: ${err instanceof Error ? err.message : String(err)}`);
		return { input: parsed.data, result: null };
	}
}

/** Render the PDF of a snapshot (a draft or an issued one). */
export async function renderSnapshot(snapshot: ReportSnapshot): Promise<Buffer> {
	return renderPdf(reportDocument(snapshot));
}

export function sha256(bytes: Uint8Array): string {
	return createHash('sha256').update(bytes).digest('hex');
}

async function callerName(trx: Db, userId: string): Promise<string> {
	const u = await trx('users').where({ id: userId }).first('name', 'email');
	return u?.name ?? u?.email ?? '';
}

/* ------------------------------------------------------------------ drafts and issuing */

/** A draft PDF of the dwelling or one element: the same document, marked as a draft, never stored. */
export async function previewReport(
	caller: Caller,
	input: { dwellingId: string; elementId?: string | null }
): Promise<{ pdf: Buffer; filename: string; problems: string[] }> {
	const scope: ReportScope = input.elementId ? 'element' : 'dwelling';
	const issuedAt = new Date().toISOString();
	const { snapshot, problems } = await buildSnapshot(
		caller.organisationId,
		input.dwellingId,
		input.elementId ?? null,
		{
			scope,
			draft: true,
			number: 'DRAFT',
			revision: 0,
			verificationCode: null,
			verifyUrl: null,
			supersedes: null,
			issuedBy: { id: caller.userId, name: await callerName(db, caller.userId) }
		},
		issuedAt
	);
	if (snapshot.elements.length === 0)
		throw new ValidationError(asIssues(problems), problems[0] ?? 'Nothing to report.');
	// A draft shows what can be shown; elements that cannot be calculated are listed by the page.
	const printable = { ...snapshot, elements: snapshot.elements.filter((e) => e.result || e.u !== null) };
	if (printable.elements.length === 0)
		throw new ValidationError(asIssues(problems), 'No element can be calculated yet.');
	const pdf = await renderSnapshot(printable);
	const name =
		scope === 'element'
			? `${snapshot.dwelling.reference}-${snapshot.elements[0].name}`
			: snapshot.dwelling.reference;
	return { pdf, filename: `DRAFT-${fileSafe(name)}.pdf`, problems };
}

function fileSafe(s: string): string {
	return (
		s
			.replace(/[^A-Za-z0-9._-]+/g, '-')
			.replace(/^-+|-+$/g, '')
			.slice(0, 80) || 'report'
	);
}

export type ReportSummary = {
	id: string;
	number: string;
	revision: number;
	scope: ReportScope;
	dwellingId: string;
	elementId: string | null;
	elementName: string | null;
	supersedesId: string | null;
	supersededById: string | null;
	engineVersion: string;
	verificationCode: string;
	sha256: string;
	issuedAt: string;
	issuedBy: { id: string; name: string };
	filename: string;
	bytes: number;
};

function reportFilename(number: string, revision: number): string {
	return `${fileSafe(number)}-rev${revision}.pdf`;
}

function toSummary(r: Record<string, unknown>): ReportSummary {
	const number = r.number as string;
	const revision = Number(r.revision);
	return {
		id: r.id as string,
		number,
		revision,
		scope: r.scope as ReportScope,
		dwellingId: r.dwelling_id as string,
		elementId: (r.element_id as string) ?? null,
		elementName: (r.element_name as string) ?? null,
		supersedesId: (r.supersedes_id as string) ?? null,
		supersededById: (r.superseded_by_id as string) ?? null,
		engineVersion: r.engine_version as string,
		verificationCode: r.verification_code as string,
		sha256: r.sha256 as string,
		issuedAt: new Date(r.issued_at as string).toISOString(),
		issuedBy: {
			id: r.issued_by as string,
			name: ((r.issued_by_name as string) ?? (r.issued_by_email as string)) || ''
		},
		filename: reportFilename(number, revision),
		bytes: Number(r.bytes ?? 0)
	};
}

function summaryQuery(trx: Db, organisationId: string) {
	return trx('reports as r')
		.leftJoin('users as u', 'u.id', 'r.issued_by')
		.where('r.organisation_id', organisationId)
		.select(
			'r.id',
			'r.number',
			'r.revision',
			'r.scope',
			'r.dwelling_id',
			'r.element_id',
			'r.supersedes_id',
			'r.engine_version',
			'r.verification_code',
			'r.sha256',
			'r.issued_at',
			'r.issued_by',
			'u.name as issued_by_name',
			'u.email as issued_by_email',
			trx.raw(`r.snapshot #>> '{elements,0,name}' as element_name`),
			trx.raw('octet_length(r.pdf) as bytes'),
			trx.raw(
				'(select n.id from reports n where n.supersedes_id = r.id and n.organisation_id = r.organisation_id limit 1) as superseded_by_id'
			)
		);
}

/**
 * Issue a report: freeze the snapshot, render and hash the PDF, store it under a number (a new one,
 * or the next revision of the report it supersedes) and a verification code; a dwelling report also
 * marks the dwelling issued. All in one transaction. Only the dwelling's assessor issues
 * (`issueRefusal` in `$lib/dwellings/rules`; 403 otherwise), and the declaration names them.
 */
export async function issueReport(
	caller: Caller,
	input: { dwellingId: string; elementId?: string | null },
	origin: string,
	trx?: Db
): Promise<ReportSummary> {
	const run = async (t: Db) => {
		// One issuer at a time per organisation keeps numbers and revisions gap-free and unique.
		await t.raw('select pg_advisory_xact_lock(hashtext(?))', [`reports:${caller.organisationId}`]);
		const dwelling = await getDwellingRow(caller.organisationId, input.dwellingId, t, true);
		const membership = await t('memberships')
			.where({ organisation_id: caller.organisationId, user_id: caller.userId })
			.first('role');
		if (!membership) throw new NotFoundError('No such dwelling.');
		const refusal = issueRefusal(
			{ userId: caller.userId, role: membership.role as Role },
			dwelling.assessor_id ?? null
		);
		if (refusal) throw new ForbiddenError(refusal);
		if (dwelling.status === 'archived')
			throw new ConflictError('The dwelling is archived: reports cannot be issued for it.');
		const scope: ReportScope = input.elementId ? 'element' : 'dwelling';
		const prevQuery = t('reports')
			.where({ organisation_id: caller.organisationId, dwelling_id: input.dwellingId, scope })
			.orderBy('revision', 'desc')
			.first('id', 'number', 'revision', 'issued_at');
		if (input.elementId) prevQuery.andWhere({ element_id: input.elementId });
		else prevQuery.whereNull('element_id');
		const prev = await prevQuery;

		const now = new Date();
		const issuedAt = now.toISOString();
		let number: string;
		if (prev) number = prev.number;
		else {
			const org = await t('organisations').where({ id: caller.organisationId }).first('name');
			const year = now.getUTCFullYear();
			const prefix = `${numberPrefix(org?.name ?? '')}-${year}-`;
			const { n } = (await t('reports')
				.where({ organisation_id: caller.organisationId })
				.andWhere('number', 'like', `${prefix}%`)
				.countDistinct({ n: 'number' })
				.first()) as { n: number };
			number = `${prefix}${String(Number(n) + 1).padStart(4, '0')}`;
		}
		const revision = prev ? Number(prev.revision) + 1 : 1;
		const code = newVerificationCode();
		const { snapshot, problems } = await buildSnapshot(
			caller.organisationId,
			input.dwellingId,
			input.elementId ?? null,
			{
				scope,
				draft: false,
				number,
				revision,
				verificationCode: code,
				verifyUrl: verifyUrlFor(origin, code),
				supersedes: prev
					? {
							number: prev.number,
							revision: Number(prev.revision),
							issuedAt: new Date(prev.issued_at).toISOString()
						}
					: null,
				issuedBy: { id: caller.userId, name: await callerName(t, caller.userId) }
			},
			issuedAt,
			t
		);
		if (problems.length) {
			throw new ValidationError(
				asIssues(problems),
				`The report cannot be issued: ${problems.length} problem(s) to fix first.`
			);
		}
		const pdf = await renderSnapshot(snapshot);
		const hash = sha256(pdf);
		const [row] = await t('reports')
			.insert({
				organisation_id: caller.organisationId,
				number,
				revision,
				scope,
				dwelling_id: input.dwellingId,
				element_id: input.elementId ?? null,
				supersedes_id: prev?.id ?? null,
				snapshot: JSON.stringify(snapshot),
				engine_version: ENGINE_VERSION,
				verification_code: code,
				sha256: hash,
				pdf,
				issued_by: caller.userId,
				issued_at: now
			})
			.returning('id');
		await logActivity(
			{
				organisationId: caller.organisationId,
				userId: caller.userId,
				action: 'issue',
				entity: 'report',
				entityId: row.id,
				details: {
					number,
					revision,
					scope,
					dwellingId: input.dwellingId,
					elementId: input.elementId ?? null,
					sha256: hash,
					supersedesId: prev?.id ?? null
				}
			},
			t
		);
		// The new report is the dwelling as it is now: nothing differs from the issued record.
		if (scope === 'dwelling')
			await t('dwellings')
				.where({ id: dwelling.id, organisation_id: caller.organisationId })
				.update({ issue_changes: 0 });
		if (scope === 'dwelling' && dwelling.status !== 'issued' && dwelling.status !== 'awaiting-review') {
			await t('dwellings')
				.where({ id: dwelling.id, organisation_id: caller.organisationId })
				.update({ status: 'issued', version: t.raw('version + 1'), updated_at: t.fn.now() });
			await logActivity(
				{
					organisationId: caller.organisationId,
					userId: caller.userId,
					action: 'status',
					entity: 'dwelling',
					entityId: dwelling.id,
					details: { from: dwelling.status, to: 'issued', reportId: row.id, number, revision }
				},
				t
			);
		}
		const summary = await summaryQuery(t, caller.organisationId).where('r.id', row.id).first();
		return toSummary(summary);
	};
	return trx ? run(trx) : db.transaction(run);
}

/* ------------------------------------------------------------------ reading */

/** Every report of a dwelling (both scopes), newest first. */
export async function listReportsForDwelling(
	organisationId: string,
	dwellingId: string
): Promise<ReportSummary[]> {
	await getDwellingRow(organisationId, dwellingId);
	const rows = await summaryQuery(db, organisationId)
		.where('r.dwelling_id', dwellingId)
		.orderBy([
			{ column: 'r.issued_at', order: 'desc' },
			{ column: 'r.revision', order: 'desc' }
		]);
	return rows.map(toSummary);
}

/** The newest revision of the dwelling-scope report, with its snapshot (for audits). */
export async function getLatestReportForDwelling(
	organisationId: string,
	dwellingId: string
): Promise<(ReportSummary & { snapshot: ReportSnapshot }) | null> {
	const row = await summaryQuery(db, organisationId)
		.select('r.snapshot')
		.where({ 'r.dwelling_id': dwellingId, 'r.scope': 'dwelling' })
		.orderBy('r.revision', 'desc')
		.first();
	return row ? { ...toSummary(row), snapshot: row.snapshot as ReportSnapshot } : null;
}

export async function getReport(
	organisationId: string,
	reportId: string
): Promise<(ReportSummary & { snapshot: ReportSnapshot }) | null> {
	const row = await summaryQuery(db, organisationId).select('r.snapshot').where('r.id', reportId).first();
	return row ? { ...toSummary(row), snapshot: row.snapshot as ReportSnapshot } : null;
}

export async function getReportPdf(
	organisationId: string,
	reportId: string
): Promise<{ pdf: Buffer; filename: string; sha256: string } | null> {
	const row = await db('reports')
		.where({ id: reportId, organisation_id: organisationId })
		.first('pdf', 'number', 'revision', 'sha256');
	return row
		? { pdf: row.pdf as Buffer, filename: reportFilename(row.number, row.revision), sha256: row.sha256 }
		: null;
}

/** Render the stored snapshot again (for checks: the numbers, and the bytes, come out the same). */
export async function rerenderReport(organisationId: string, reportId: string): Promise<Buffer | null> {
	const row = await db('reports').where({ id: reportId, organisation_id: organisationId }).first('snapshot');
	return row ? renderSnapshot(row.snapshot as ReportSnapshot) : null;
}

/* ------------------------------------------------------------------ e-mail */

export type MailSummary = {
	id: string;
	reportId: string | null;
	reportLabel: string | null;
	to: string;
	subject: string;
	status: 'queued' | 'sent' | 'failed';
	attempts: number;
	lastError: string | null;
	createdAt: string;
	sentAt: string | null;
	nextAttemptAt: string;
	createdBy: string | null;
};

/**
 * Queue an e-mail of an issued report (PDF attached) to the client, in one transaction with its
 * activity entry; the outbox worker sends it.
 */
export async function emailReport(
	caller: Caller,
	reportId: string,
	input: { to: string; message?: string | null },
	/** when given, the report must be of this dwelling (404 otherwise) */
	scope?: { dwellingId: string }
): Promise<MailSummary> {
	const id = await db.transaction(async (t) => {
		const report = await t('reports')
			.where({ id: reportId, organisation_id: caller.organisationId })
			.modify((q) => {
				if (scope?.dwellingId) q.where('dwelling_id', scope.dwellingId);
			})
			.first(
				'id',
				'number',
				'revision',
				'scope',
				'dwelling_id',
				'issued_at',
				'verification_code',
				'snapshot'
			);
		if (!report) throw new NotFoundError('No such report.');
		// A replaced revision stays readable and verifiable, but the client is sent the one in force.
		const newer = await t('reports')
			.where({ supersedes_id: report.id, organisation_id: caller.organisationId })
			.first('revision');
		const refusal = supersededMailRefusal(report, newer);
		if (refusal) throw new ConflictError(refusal);
		const snap = report.snapshot as ReportSnapshot;
		const sender = await callerName(t, caller.userId);
		const mail = reportMail({
			snapshot: snap,
			number: report.number,
			revision: Number(report.revision),
			issuedAt: new Date(report.issued_at).toISOString(),
			verificationCode: report.verification_code,
			sender,
			message: input.message ?? null
		});
		const outboxId = await enqueueMail(
			{
				organisationId: caller.organisationId,
				dwellingId: report.dwelling_id,
				reportId: report.id,
				purpose: 'report',
				to: input.to,
				subject: mail.subject,
				text: mail.text,
				html: mail.html,
				attachments: [{ filename: reportFilename(report.number, report.revision), reportId: report.id }],
				createdBy: caller.userId
			},
			t
		);
		await logActivity(
			{
				organisationId: caller.organisationId,
				userId: caller.userId,
				action: 'email',
				entity: 'report',
				entityId: report.id,
				details: { to: input.to, outboxId, number: report.number, revision: report.revision }
			},
			t
		);
		return outboxId;
	});
	kickOutbox();
	const mail = await getMail(caller.organisationId, id);
	return mail!;
}

/**
 * The client's e-mail of an issued report: the covering note, the summary for the client in plain words
 * with its cautions (client-summary.ts, the words of the PDF's first pages), how to check the PDF is
 * genuine, and the sender. As plain text and as HTML, the same content: the HTML is styled inline (mail
 * programs drop style sheets), loads nothing from elsewhere, and every piece of text in it is escaped,
 * so a name or a message comes out as text whatever characters it holds. Pure.
 */
export function reportMail(m: {
	snapshot: ReportSnapshot;
	number: string;
	revision: number;
	issuedAt: string;
	verificationCode: string;
	sender: string;
	message: string | null;
}): { subject: string; text: string; html: string } {
	const snap = m.snapshot;
	const ref = snap.dwelling.reference;
	const what =
		snap.document.scope === 'dwelling'
			? `the report for dwelling ${ref}`
			: `the report for the element "${snap.elements[0]?.name ?? ''}" of dwelling ${ref}`;
	const subject = `Report ${m.number} revision ${m.revision} — ${ref}`;
	const greeting = snap.dwelling.clientName ? `Dear ${snap.dwelling.clientName},` : 'Hello,';
	const opening = `Please find attached ${what}, report ${m.number} revision ${m.revision}, issued on ${longDate(m.issuedAt)}.`;
	const message = m.message?.trim() || null;
	const verify = `You can check that the PDF is genuine at ${snap.document.verifyUrl} (verification code ${groupCode(m.verificationCode)}).`;
	const technical =
		'The results are steady-state calculations that support, and do not replace, professional judgement; check them against the local building codes and licensed practice.';
	// The summary's own line on checking the report is said once, below it, with the link.
	const c = clientSummary(snap);
	const next = c.nextSteps.items.filter(
		(f) => !f.text.startsWith('You can check that the report is genuine')
	);
	const lead = (f: Finding) => (TONE_WORDS[f.tone] ? `${TONE_WORDS[f.tone]}: ` : '');
	const para = (f: Finding) => `${lead(f)}${f.label ? `${f.label}. ` : ''}${f.text}`;
	const signature = [m.sender, snap.organisation.name].filter(Boolean);

	const rule = '-'.repeat(60);
	/** paragraphs with a blank line after each */
	const paras = (list: string[]) => list.flatMap((x) => [x, '']);
	const text = [
		greeting,
		'',
		opening,
		'',
		...(message ? [message, ''] : []),
		rule,
		c.kicker.toUpperCase(),
		rule,
		'',
		`In short: ${c.headline.text}`,
		'',
		...paras(c.intro),
		c.assessed.heading.toUpperCase(),
		...paras(c.assessed.paragraphs),
		c.heatLoss.heading.toUpperCase(),
		...paras(c.heatLoss.paragraphs.map(para)),
		...c.table.rows.map(
			(r) =>
				`- ${r.name} (${r.kind.toLowerCase()}): U-value ${r.u === '—' ? 'not worked out' : `${r.u} ${c.table.columns.unit}`}, limit ${r.limit === 'none set' ? 'none set' : `${r.limit} ${c.table.columns.unit}`}, ${r.verdict.text}; damp and mould: ${r.moisture.text.charAt(0).toLowerCase()}${r.moisture.text.slice(1)}.`
		),
		'',
		c.moisture.heading.toUpperCase(),
		...paras(c.moisture.paragraphs.map(para)),
		c.nextSteps.heading.toUpperCase(),
		...next.map((f) => `- ${para(f)}`),
		'',
		c.cautions.heading.toUpperCase(),
		...c.cautions.items.map((x) => `- ${x}`),
		'',
		c.closing,
		'',
		rule,
		'',
		verify,
		'',
		technical,
		'',
		...signature
	];

	const e = escapeHtml;
	const ink = TONE_COLOURS.none;
	const soft = '#4a463e';
	const line = '#ddd5c6';
	const h = (s: string) =>
		`<h2 style="font-size:17px;line-height:1.3;margin:22px 0 6px;color:${ink};font-weight:600">${e(s)}</h2>`;
	const p = (inner: string, style = '') => `<p style="margin:0 0 10px;${style}">${inner}</p>`;
	const findingHtml = (f: Finding) =>
		`${TONE_WORDS[f.tone] ? `<strong style="color:${TONE_COLOURS[f.tone]}">${e(TONE_WORDS[f.tone])}:</strong> ` : ''}${f.label ? `<strong>${e(f.label)}.</strong> ` : ''}${e(f.text)}`;
	const cell = (inner: string, extra = '') =>
		`<td style="padding:6px 8px;border-bottom:1px solid ${line};vertical-align:top;${extra}">${inner}</td>`;
	/** a column heading; its unit on a line of its own, never split */
	const head = (s: string, right = false, unit?: string) =>
		`<th style="padding:6px 8px;border-bottom:2px solid ${soft};text-align:${right ? 'right' : 'left'};font-size:13px;color:${soft};font-weight:600;vertical-align:bottom">${e(s).replace('(U-value)', '<span style="white-space:nowrap">(U-value)</span>')}${unit ? `<br><span style="white-space:nowrap">${e(unit)}</span>` : ''}</th>`;
	const toneText = (f: Finding, bold: boolean) =>
		`<span style="color:${f.tone === 'none' ? soft : TONE_COLOURS[f.tone]};${f.tone !== 'none' && bold ? 'font-weight:600' : ''}">${e(f.text)}</span>`;
	const cols = c.table.columns;
	const table = `<table cellspacing="0" cellpadding="0" style="border-collapse:collapse;width:100%;font-size:14px;margin:4px 0 10px">
<thead><tr>${head(cols.name)}${head(cols.kind)}${head(cols.u, true, cols.unit)}${head(cols.limit, true, cols.unit)}${head(cols.verdict)}${head(cols.moisture)}</tr></thead>
<tbody>${c.table.rows
		.map(
			(r) =>
				`<tr>${cell(`<strong>${e(r.name)}</strong>`)}${cell(e(r.kind))}${cell(e(r.u), 'text-align:right;white-space:nowrap')}${cell(e(r.limit), 'text-align:right;white-space:nowrap')}${cell(toneText(r.verdict, true))}${cell(toneText(r.moisture, false))}</tr>`
		)
		.join('\n')}</tbody></table>`;
	const list = (items: string[]) =>
		`<ul style="margin:0 0 10px;padding-left:22px">${items.map((i) => `<li style="margin:0 0 6px">${i}</li>`).join('')}</ul>`;
	const verifyUrl = snap.document.verifyUrl ?? '';
	const html = `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1"><title>${e(subject)}</title></head>
<body style="margin:0;padding:0;background:#f6f3ec">
<div style="max-width:680px;margin:0 auto;padding:24px 20px;background:#fffdf8;color:${ink};font-family:'Source Sans 3','Source Sans Pro',Arial,Helvetica,sans-serif;font-size:15px;line-height:1.5">
${p(e(greeting))}
${p(e(opening))}
${message ? p(e(message).replace(/\r?\n/g, '<br>')) : ''}
<div style="border-top:1px solid ${line};margin:20px 0 0;padding-top:14px">
<div style="font-size:12px;letter-spacing:0.06em;text-transform:uppercase;color:#c2571a;font-weight:600">${e(c.kicker)}</div>
<h1 style="font-size:22px;line-height:1.25;margin:4px 0 12px;font-weight:600">${e(c.title)}</h1>
<div style="background:#efeae0;padding:10px 12px;margin:0 0 12px;font-weight:600;color:${TONE_COLOURS[c.headline.tone]}">In short: ${e(c.headline.text)}</div>
${c.intro.map((x) => p(e(x))).join('\n')}
${h(c.assessed.heading)}
${c.assessed.paragraphs.map((x) => p(e(x))).join('\n')}
${h(c.heatLoss.heading)}
${c.heatLoss.paragraphs.map((f) => p(findingHtml(f))).join('\n')}
${table}
${h(c.moisture.heading)}
${c.moisture.paragraphs.map((f) => p(findingHtml(f))).join('\n')}
${h(c.nextSteps.heading)}
${list(next.map(findingHtml))}
${h(c.cautions.heading)}
${list(c.cautions.items.map(e))}
${p(e(c.closing), `color:${soft}`)}
</div>
<div style="border-top:1px solid ${line};margin:20px 0 0;padding-top:14px">
${p(`You can check that the PDF is genuine at <a href="${e(verifyUrl)}" style="color:#7a3b12">${e(verifyUrl)}</a> (verification code <strong>${e(groupCode(m.verificationCode))}</strong>).`)}
${p(e(technical), `color:${soft}`)}
${p(signature.map(e).join('<br>'))}
</div>
</div>
</body></html>
`;
	return { subject, text: text.join('\n').trim() + '\n', html };
}

function mailQuery(organisationId: string) {
	return db('mail_outbox as o')
		.leftJoin('reports as r', 'r.id', 'o.report_id')
		.leftJoin('users as u', 'u.id', 'o.created_by')
		.where('o.organisation_id', organisationId)
		.select(
			'o.*',
			'r.number as report_number',
			'r.revision as report_revision',
			'u.name as created_by_name',
			'u.email as created_by_email'
		);
}

function toMail(r: Record<string, unknown>): MailSummary {
	return {
		id: r.id as string,
		reportId: (r.report_id as string) ?? null,
		reportLabel: r.report_number ? `${r.report_number} rev. ${r.report_revision}` : null,
		to: r.to_address as string,
		subject: r.subject as string,
		status: r.status as MailSummary['status'],
		attempts: Number(r.attempts),
		lastError: (r.last_error as string) ?? null,
		createdAt: new Date(r.created_at as string).toISOString(),
		sentAt: r.sent_at ? new Date(r.sent_at as string).toISOString() : null,
		nextAttemptAt: new Date(r.next_attempt_at as string).toISOString(),
		createdBy: ((r.created_by_name as string) ?? (r.created_by_email as string)) || null
	};
}

export async function getMail(organisationId: string, id: string): Promise<MailSummary | null> {
	const row = await mailQuery(organisationId).where('o.id', id).first();
	return row ? toMail(row) : null;
}

/** What was sent for a dwelling, to whom and when, newest first. */
export async function listMailForDwelling(
	organisationId: string,
	dwellingId: string
): Promise<MailSummary[]> {
	const rows = await mailQuery(organisationId)
		.where('o.dwelling_id', dwellingId)
		.orderBy('o.created_at', 'desc')
		.limit(200);
	return rows.map(toMail);
}

export async function listMailForReport(organisationId: string, reportId: string): Promise<MailSummary[]> {
	const rows = await mailQuery(organisationId).where('o.report_id', reportId).orderBy('o.created_at', 'desc');
	return rows.map(toMail);
}

/* ------------------------------------------------------------------ public verification */

export type VerifiedReport = {
	number: string;
	revision: number;
	issuedAt: string;
	dwellingReference: string;
	/** who issued and signed it, with their registration number as frozen at issue */
	issuedBy: string;
	/** The revision that replaced this one, when there is one: its revision number and date only. */
	supersededBy: { revision: number; issuedAt: string } | null;
};

/**
 * What the public page may show for a code: the report's number and revision, its date, the dwelling
 * reference and who issued it (no other dwelling data), and whether a later revision superseded it.
 * The issuer is the one frozen in the snapshot; a snapshot without one names the user who issued it.
 */
export async function verifyCode(rawCode: string): Promise<VerifiedReport | null> {
	const code = normaliseCode(rawCode);
	if (!/^[0-9A-Z]{10}$/.test(code)) return null;
	const row = await db('reports as r')
		.leftJoin('users as u', 'u.id', 'r.issued_by')
		.where({ 'r.verification_code': code })
		.first(
			'r.id',
			'r.organisation_id',
			'r.number',
			'r.revision',
			'r.issued_at',
			db.raw(`r.snapshot #>> '{dwelling,reference}' as reference`),
			db.raw(`coalesce(r.snapshot #>> '{document,issuedBy,name}', u.name, u.email) as issuer_name`),
			db.raw(`r.snapshot #>> '{document,issuedBy,registrationNumber}' as issuer_reg`)
		);
	if (!row) return null;
	const newer = await db('reports')
		.where({ supersedes_id: row.id, organisation_id: row.organisation_id })
		.orderBy('revision')
		.first('revision', 'issued_at');
	return {
		number: row.number,
		revision: Number(row.revision),
		issuedAt: new Date(row.issued_at).toISOString(),
		dwellingReference: row.reference ?? '',
		issuedBy: row.issuer_name
			? `${row.issuer_name}${row.issuer_reg ? `, registration no. ${row.issuer_reg}` : ''}`
			: '—',
		supersededBy: newer
			? { revision: Number(newer.revision), issuedAt: new Date(newer.issued_at).toISOString() }
			: null
	};
}

/** Whether the bytes are exactly the PDF issued under the code (SHA-256). */
export async function checkPdfAgainstCode(
	rawCode: string,
	bytes: Uint8Array
): Promise<'match' | 'mismatch' | 'unknown'> {
	return checkHashAgainstCode(rawCode, sha256(bytes));
}

/** The same for a SHA-256 (hex) computed in the browser, so the PDF never leaves the device. */
export async function checkHashAgainstCode(
	rawCode: string,
	hash: string
): Promise<'match' | 'mismatch' | 'unknown'> {
	const code = normaliseCode(rawCode);
	if (!/^[0-9A-Z]{10}$/.test(code)) return 'unknown';
	const row = await db('reports').where({ verification_code: code }).first('sha256');
	if (!row) return 'unknown';
	return hash.toLowerCase() === row.sha256 ? 'match' : 'mismatch';
}

/** Words used in page tables, shared with the PDF. */
export { passWord, moistureWord };
