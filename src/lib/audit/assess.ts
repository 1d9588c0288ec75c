/**
 * The audit of one dwelling, pure: every element recomputed with today's engine, once with the material
 * revisions the assessor used and once with the library's current revisions, compared with the latest
 * issued dwelling report, and flagged. No I/O: the server module loads the rows, this decides. Each flag
 * is raised by one rule in ./checks; this module composes them, in a fixed order.
 */
import { ENGINE_VERSION, plausibilityWarnings, type PlausibilityWarning } from '$lib/physics';
import { GIVEN_U_KINDS } from '$lib/dwellings/kinds';
import { toElementInput, type StoredLayer } from '$lib/dwellings/element-input';
import { plausibleForMaterial } from './plausible';
import type { Flag } from './flags';
import type {
	AuditElement,
	DwellingAudit,
	DwellingBundle,
	ElementRecompute,
	JunctionRecompute
} from './types';
import {
	givenOutcome,
	issuedOutcome,
	layerRevisions,
	recomputeBuildUp,
	reproduceIssued,
	type AnalysisCache,
	type LayerRevisions
} from './element-recompute';
import {
	elementContext,
	elementFlag,
	layerContext,
	limitTableName,
	type ElementContext,
	type LayerContext
} from './checks/context';
import {
	addedAfterIssue,
	changedAfterIssue,
	notIssued,
	removedAfterIssue,
	removedSinceIssue
} from './checks/report';
import {
	condensationAccumulates,
	givenUOverLimit,
	windowPartsDisagree,
	nothingToCompute,
	recomputeFailed,
	surfaceMouldRisk,
	uOverLimit
} from './checks/results';
import { issuedInputFails, issuedNumbersDiffer, libraryChanged } from './checks/reproduction';
import {
	genericLambdas,
	newLibraryUses,
	noteUse,
	revisionMissing,
	revisionSuperseded,
	unverifiedRevisions,
	valuesDifferFromRevision,
	type LibraryUses
} from './checks/library';
import {
	givenUImplausible,
	insulationLayerTooThick,
	lambdaImplausible,
	thicknessOutsideSupplied,
	totalThicknessImplausible
} from './checks/plausibility';
import { elementFramedWithoutBridging, layerFramedWithoutBridging } from './checks/framing';
import {
	junctionAddedAfterIssue,
	junctionChanged,
	junctionChangedAfterIssue,
	junctionContext,
	junctionFRsiBelowLimit,
	junctionRecomputeFailed,
	junctionRemovedAfterIssue,
	junctionsRemovedSinceIssue,
	psiEntered,
	psiWithoutSource
} from './checks/junctions';
import { issuedJunction, recomputeJunction, type JunctionCache } from './junction-recompute';

export type {
	AuditElement,
	AuditJunction,
	AuditReport,
	DwellingAudit,
	DwellingBundle,
	ElementRecompute,
	JunctionOutcome,
	JunctionRecompute,
	LimitTableInfo,
	Outcome,
	RemovedElement,
	RemovedJunction,
	RevisionInfo,
	SnapshotElement,
	SnapshotJunction
} from './types';
export type { AnalysisCache } from './element-recompute';
export type { JunctionCache } from './junction-recompute';
export { outcomeOf, layerFromRevision } from './element-recompute';
export { canonical } from './compare';

/**
 * Recompute and flag one dwelling. `cache` and `junctionCache` may be shared across the dwellings of a
 * batch: the engine is a pure function, so an identical input (a build-up repeated from a template, a
 * junction of the same elements) is calculated once.
 *
 * Flags come in this order: the dwelling's (not issued); per element, in the dwelling's order, its
 * staleness, its recompute, its reproduction of the issued numbers, its result against the limit and
 * the moisture criteria, then its layers; then the library revisions used (unverified, generic λ); then
 * the elements removed since the report; then per junction, in the dwelling's order, its staleness, its
 * recompute, its ψ and fRsi against the issued ones, its fRsi against the limit, an entered ψ and its
 * source; then the junctions removed since the report.
 */
export function auditDwelling(
	b: DwellingBundle,
	cache: AnalysisCache = new Map(),
	junctionCache: JunctionCache = new Map()
): DwellingAudit {
	const report = b.report;
	const snapshots = new Map((report?.snapshot.elements ?? []).map((e) => [e.id, e]));
	const flags: Flag[] = [...notIssued(report)];
	const uses = newLibraryUses();
	const elements: ElementRecompute[] = [];
	for (const el of b.elements) {
		const ctx = elementContext(el, snapshots.get(el.id), report, b.limitTable);
		flags.push(...addedAfterIssue(ctx), ...changedAfterIssue(ctx, b.climateId));
		elements.push(takesGivenU(el) ? auditGivenU(ctx, flags) : auditBuildUp(ctx, b, cache, uses, flags));
	}
	flags.push(...unverifiedRevisions(uses.unverified), ...genericLambdas(uses.generic));
	const removedElements = removedSinceIssue(snapshots.values(), b.elements);
	flags.push(...removedAfterIssue(removedElements, report));
	const junctions = auditJunctions(b, junctionCache, flags);
	return {
		engineVersion: ENGINE_VERSION,
		reportId: report?.id ?? null,
		reportNumber: report?.number ?? null,
		reportRevision: report?.revision ?? null,
		issuedAt: report?.issuedAt ?? null,
		limitTable: limitTableName(b.limitTable),
		elements,
		removedElements,
		...junctions,
		flags
	};
}

/**
 * The dwelling's junctions: each computed again (an entered ψ taken as entered), compared with the
 * report and judged; then those of the report removed since. Nothing (no `junctions` in the audit) for a
 * dwelling without junctions in either.
 */
function auditJunctions(
	b: DwellingBundle,
	cache: JunctionCache,
	flags: Flag[]
): Pick<DwellingAudit, 'junctions' | 'removedJunctions'> {
	const report = b.report;
	const recorded = report?.snapshot.junctions ?? [];
	const list = b.junctions ?? [];
	if (!list.length && !recorded.length) return {};
	const snaps = new Map(recorded.map((j) => [j.id, j]));
	const months = b.climateId ? (b.climates.get(b.climateId) ?? null) : null;
	const out: JunctionRecompute[] = [];
	for (const j of list) {
		const ctx = junctionContext(j, snaps.get(j.id), report);
		flags.push(...junctionAddedAfterIssue(ctx), ...junctionChangedAfterIssue(ctx));
		const rec: JunctionRecompute = {
			junctionId: j.id,
			name: j.name,
			type: j.type,
			lengthM: j.lengthM,
			source: j.source,
			dimensionSystem: j.dimensionSystem,
			psiSource: j.psiSource,
			issued: issuedJunction(ctx.snapshot),
			current: null,
			inSnapshot: Boolean(ctx.snapshot)
		};
		const computed = recomputeJunction(j, b.elements, months, cache);
		if (computed && 'error' in computed) rec.error = computed.error;
		else if (computed) rec.current = computed;
		else
			rec.current = {
				psi: j.psiEntered,
				fRsi: null,
				fRsiMin: null,
				criticalMonth: null,
				surfacePass: null,
				ruleOfThumb: null
			};
		flags.push(
			...junctionRecomputeFailed(ctx, rec.error),
			...junctionChanged(ctx, rec.issued, rec.current),
			...(j.source === 'calculated' ? junctionFRsiBelowLimit(ctx, rec.current) : []),
			...psiEntered(ctx),
			...psiWithoutSource(ctx)
		);
		out.push(rec);
	}
	const removedJunctions = junctionsRemovedSinceIssue(recorded, list);
	flags.push(...junctionRemovedAfterIssue(removedJunctions, report));
	return { junctions: out, removedJunctions };
}

/** Windows and doors, and any element without a build-up, are judged by their given U. */
const takesGivenU = (el: AuditElement) => GIVEN_U_KINDS.includes(el.kind) || !el.buildUp;

/** The record of an element before anything is recomputed: what the report issued for it. */
function startRecord(ctx: ElementContext): ElementRecompute {
	const el = ctx.element;
	return {
		elementId: el.id,
		name: el.name,
		kind: el.kind,
		area: el.area,
		limit: ctx.limit,
		givenU: el.givenU,
		issued: issuedOutcome(ctx.snapshot),
		used: null,
		current: null,
		reproduced: null,
		inSnapshot: Boolean(ctx.snapshot)
	};
}

/** A window, door or element without a build-up: its given U against the limit and the usual range. */
function auditGivenU(ctx: ElementContext, flags: Flag[]): ElementRecompute {
	const rec = startRecord(ctx);
	const u = ctx.element.givenU;
	if (u !== null) rec.used = rec.current = givenOutcome(u);
	else rec.error = 'no build-up and no given U-value';
	flags.push(
		...givenUOverLimit(ctx),
		...givenUImplausible(ctx),
		...nothingToCompute(ctx),
		...windowPartsDisagree(ctx)
	);
	return rec;
}

/** An element with a build-up: recomputed, compared with the report, judged, and its layers checked. */
function auditBuildUp(
	ctx: ElementContext,
	b: DwellingBundle,
	cache: AnalysisCache,
	uses: LibraryUses,
	flags: Flag[]
): ElementRecompute {
	const rec = startRecord(ctx);
	const layers = ctx.element.buildUp!.layers ?? [];
	const revs = layerRevisions(layers, b);
	const recomputed = recomputeBuildUp(ctx.element, b, revs, cache);
	rec.used = recomputed.used;
	if (recomputed.error !== undefined) rec.error = recomputed.error;
	flags.push(...recomputeFailed(ctx, recomputed.error));
	rec.current = recomputed.current;
	if (ctx.snapshot && ctx.snapshot.result) {
		const reproduced = reproduceIssued(ctx.snapshot, b.revisions, cache);
		if (!('error' in reproduced)) rec.reproduced = reproduced.outcome;
		flags.push(
			...issuedInputFails(ctx, reproduced),
			...issuedNumbersDiffer(ctx, rec.issued, rec.reproduced),
			...libraryChanged(ctx, rec.issued, rec.current, revs.replaced())
		);
	}
	if (rec.used)
		flags.push(
			...uOverLimit(ctx, rec.used),
			...condensationAccumulates(ctx, rec.used),
			...surfaceMouldRisk(ctx, rec.used)
		);
	checkLayers(ctx, layers, revs, uses, flags);
	return rec;
}

/** Every layer's checks in the order of the build-up, then the build-up's as a whole. */
function checkLayers(
	ctx: ElementContext,
	layers: StoredLayer[],
	revs: LayerRevisions,
	uses: LibraryUses,
	flags: Flag[]
): void {
	const contexts = layers.map((layer, i) => layerContext(ctx, i, layer, revs.used(i), revs.current(i)));
	contexts.forEach((l) => {
		noteUse(uses, l);
		flags.push(
			...revisionMissing(l),
			...revisionSuperseded(l),
			...valuesDifferFromRevision(l),
			...thicknessOutsideSupplied(l),
			...lambdaImplausible(l),
			...insulationLayerTooThick(l),
			...layerFramedWithoutBridging(l)
		);
	});
	flags.push(
		...elementFramedWithoutBridging(ctx, contexts, flags),
		...totalThicknessImplausible(ctx, layers)
	);
	flags.push(...inputImplausible(ctx, contexts, flags));
}

/** The flag a plausibility warning would repeat when that flag already stands on the same layer. */
const SAME_AS: Partial<Record<PlausibilityWarning['check'], Flag['code']>> = {
	'layer-too-thick': 'thickness-implausible',
	'layer-too-thin': 'thickness-implausible',
	'thickness-outside-range': 'thickness-implausible',
	'lambda-outside-range': 'lambda-implausible'
};

/**
 * `input-implausible` (low): the engine's plausibility warnings of the element as entered (the same
 * the assessor saw in the editor and the report prints), each layer judged with the ranges it carries
 * from the library, else those of the revision it names (./plausible). A warning is left out where a
 * flag of its kind already stands on the same layer (`lambda-implausible`, `thickness-implausible`).
 */
function inputImplausible(ctx: ElementContext, layers: LayerContext[], flags: Flag[]): Flag[] {
	const el = ctx.element;
	const stored = layers.map((l) =>
		l.layer.plausible || !l.rev ? l.layer : { ...l.layer, plausible: plausibleForMaterial(l.rev) }
	);
	const input = toElementInput({
		heatFlow: el.heatFlow,
		buildUp: { ...el.buildUp!, layers: stored },
		internal: el.internal
	});
	const standing = (code: Flag['code'] | undefined, i: number | undefined) =>
		code !== undefined && flags.some((f) => f.code === code && f.elementId === el.id && f.layerIndex === i);
	return plausibilityWarnings(input)
		.filter((w) => !standing(SAME_AS[w.check], w.layerIndex))
		.map((w) => {
			const flag = elementFlag(
				ctx,
				'input-implausible',
				'low',
				`${ctx.at}: ${w.message.replace(/\.$/, '')} (${w.source}).`
			);
			return w.layerIndex === undefined ? flag : { ...flag, layerIndex: w.layerIndex };
		});
}
