// Builders of audit inputs (DwellingBundle) for the audit tests: a small invented library, elements and
// issued reports made the way the reports module makes them (the engine's input and result per
// element). Values are generic (common practice, no source); months are invented demo values.
import { analyseElement } from '../../src/lib/physics';
import { toElementInput, type StoredLayer } from '../../src/lib/dwellings/element-input';
import type {
	AuditElement,
	AuditReport,
	DwellingBundle,
	LimitTableInfo,
	Outcome,
	RevisionInfo,
	SnapshotElement
} from '../../src/lib/audit/assess';
import {
	elementContext,
	layerContext,
	type ElementContext,
	type LayerContext
} from '../../src/lib/audit/checks/context';
import type { AuditJunction, SnapshotJunction } from '../../src/lib/audit/types';
import { runJunction } from '../../src/lib/junctions/run';

/** Twelve invented months (demo values, not a real place). */
export const MONTHS = [-1, 0, 3, 7, 12, 15, 17, 17, 13, 9, 4, 1].map((t, i) => ({
	month: i + 1,
	temperature: t,
	relativeHumidity: [88, 85, 80, 75, 72, 72, 74, 76, 80, 84, 87, 89][i]
}));
/** A milder set of invented months, for a changed climate. */
export const MILD_MONTHS = MONTHS.map((m) => ({ ...m, temperature: m.temperature + 4 }));

export function rev(id: string, over: Partial<RevisionInfo> = {}): RevisionInfo {
	return {
		id,
		materialId: `m-${id}`,
		code: id.toUpperCase(),
		revision: 1,
		name: id,
		category: 'masonry',
		lambda: 0.77,
		lambdaKind: 'declared',
		resistance: null,
		muDry: 10,
		sd: null,
		thicknessMinMm: null,
		thicknessMaxMm: null,
		status: 'verified',
		...over
	};
}

/** A generic library (values common practice, no source). */
export const library = () => ({
	plaster: rev('plaster', { name: 'Gypsum plaster', category: 'plasters-linings', lambda: 0.4 }),
	block: rev('block', { name: 'Aerated block', lambda: 0.15 }),
	pir: rev('pir', { name: 'PIR board', category: 'insulation', lambda: 0.022, muDry: 60 }),
	brick: rev('brick', { name: 'Clay brick', lambda: 0.77 }),
	wool: rev('wool', { name: 'Glass mineral wool', category: 'insulation', lambda: 0.035, muDry: 1 }),
	osb: rev('osb', { name: 'OSB', category: 'timber-boards', lambda: 0.13, muDry: 50 }),
	board: rev('board', { name: 'Plasterboard', category: 'plasters-linings', lambda: 0.21 })
});

/** A layer linked to a revision, with the revision's values. */
export function linked(r: RevisionInfo, thicknessMm: number, over: Partial<StoredLayer> = {}): StoredLayer {
	const layer: StoredLayer = {
		name: r.name,
		thicknessMm,
		materialId: r.materialId,
		materialRevisionId: r.id,
		materialCode: r.code ?? undefined
	};
	if (r.lambda !== null) layer.lambda = r.lambda;
	else if (r.resistance !== null) layer.resistance = r.resistance;
	if (r.muDry !== null) layer.mu = r.muDry;
	else if (r.sd !== null) layer.sd = r.sd;
	return { ...layer, ...over };
}

/** An element with a build-up; the defaults are those of an external wall. */
export function element(id: string, layers: StoredLayer[], over: Partial<AuditElement> = {}): AuditElement {
	return {
		id,
		name: 'Front wall',
		kind: 'external-wall',
		area: 20,
		heatFlow: 'horizontal',
		buildUp: { layers },
		givenU: null,
		givenUSource: null,
		internal: { temperature: 20, humidityClass: 3 },
		climateId: 'c1',
		...over
	};
}

/** A window or door with a given U. */
export function glazed(id: string, givenU: number | null, over: Partial<AuditElement> = {}): AuditElement {
	return {
		id,
		name: 'Window',
		kind: 'window',
		area: 2,
		heatFlow: 'horizontal',
		buildUp: null,
		givenU,
		givenUSource: givenU === null ? null : 'test certificate',
		internal: null,
		climateId: null,
		...over
	};
}

/** The clean wall: plaster, block, PIR, brick, every layer linked to a verified, current revision. */
export function cleanWallLayers(lib = library()): StoredLayer[] {
	return [linked(lib.plaster, 13), linked(lib.block, 100), linked(lib.pir, 100), linked(lib.brick, 102)];
}

/** The report's record of an element as it is now, the way the reports module issues it. */
export function snapshotOf(
	el: AuditElement,
	climates: Map<string, typeof MONTHS>,
	dwellingClimateId: string | null
): SnapshotElement {
	const climateId = el.climateId ?? dwellingClimateId;
	const months = climateId ? (climates.get(climateId) ?? null) : null;
	let input = null;
	let result = null;
	if (el.buildUp) {
		input = toElementInput({ heatFlow: el.heatFlow, buildUp: el.buildUp, internal: el.internal }, months);
		try {
			result = analyseElement(input);
		} catch {
			result = null;
		}
	}
	return {
		...structuredClone(el),
		climate: climateId && months ? { id: climateId, months: structuredClone(months) } : null,
		input,
		result,
		limit: null,
		pass: null,
		materialRevisions: (el.buildUp?.layers ?? []).flatMap((l, layerIndex) =>
			l.materialRevisionId
				? [{ layerIndex, materialId: l.materialId ?? '', revisionId: l.materialRevisionId, revision: 1 }]
				: []
		)
	};
}

/** A calculated junction built from the dwelling's elements (an external corner of wall e1 unless told). */
export function junction(id: string, over: Partial<AuditJunction> = {}): AuditJunction {
	return {
		id,
		name: 'Corners',
		type: 'external-corner',
		lengthM: 10,
		source: 'calculated',
		dimensionSystem: 'external',
		psiEntered: null,
		psiSource: null,
		details: { mode: 'builder', elements: { a: 'e1' } },
		model: null,
		...over
	};
}

/** A junction whose ψ is entered from another source. */
export function enteredJunction(
	id: string,
	psi: number,
	source: string | null,
	over: Partial<AuditJunction> = {}
) {
	return junction(id, {
		name: 'Lintels',
		type: 'window-head',
		lengthM: 6,
		source: 'entered',
		psiEntered: psi,
		psiSource: source,
		details: null,
		...over
	});
}

/** The report's record of a junction as it is now, computed the way the reports module issues it. */
export function snapshotJunctionOf(
	j: AuditJunction,
	elements: AuditElement[],
	months: typeof MONTHS | null
): SnapshotJunction {
	const base = { ...structuredClone(j), model: j.model ?? undefined };
	if (j.source === 'entered' || !j.details) return { ...base, psi: j.psiEntered, fRsi: null };
	const run = runJunction({
		type: j.type,
		dimensionSystem: j.dimensionSystem,
		details: j.details,
		model: j.model ?? undefined,
		elements: elements.map((e) => ({ ...e })),
		months
	});
	return run.ok
		? { ...base, psi: run.result.psi, fRsi: run.result.surface.fRsi }
		: { ...base, psi: null, fRsi: null };
}

export const TEST_LIMITS: LimitTableInfo = {
	name: 'Test limits',
	edition: '1',
	limits: { 'external-wall': 0.3, 'pitched-roof-ceiling': 0.16, 'flat-roof': 0.18, window: 1.6, door: 1.8 }
};

/**
 * A dwelling with the given elements and library. `issued` issues a report of the elements as they are
 * (so changing them afterwards makes it stale); `current` lists revisions that are current instead of
 * the ones used.
 */
export function bundleOf(
	elements: AuditElement[],
	opts: {
		revisions?: RevisionInfo[];
		current?: RevisionInfo[];
		issued?: boolean;
		limitTable?: LimitTableInfo | null;
		climateId?: string | null;
		/** the dwelling's junctions, recorded in the report as they are (absent: a dwelling before junctions) */
		junctions?: AuditJunction[];
	} = {}
): DwellingBundle {
	const revisions = opts.revisions ?? Object.values(library());
	const climateId = opts.climateId === undefined ? 'c1' : opts.climateId;
	const climates = new Map([
		['c1', MONTHS],
		['c2', MILD_MONTHS]
	]);
	const currentRevisions = new Map(revisions.map((r) => [r.materialId, r]));
	for (const r of opts.current ?? []) currentRevisions.set(r.materialId, r);
	const report: AuditReport | null =
		opts.issued === false
			? null
			: {
					id: 'r1',
					number: 'R-1',
					revision: 1,
					issuedAt: '2024-03-01T10:00:00.000Z',
					snapshot: {
						elements: elements.map((e) => snapshotOf(e, climates, climateId)),
						...(opts.junctions
							? {
									junctions: opts.junctions.map((j) =>
										snapshotJunctionOf(j, elements, climateId ? (climates.get(climateId) ?? null) : null)
									)
								}
							: {})
					}
				};
	return {
		dwellingId: 'd1',
		climateId,
		elements,
		report,
		limitTable: opts.limitTable === undefined ? structuredClone(TEST_LIMITS) : opts.limitTable,
		climates,
		revisions: new Map([...revisions, ...(opts.current ?? [])].map((r) => [r.id, r])),
		currentRevisions,
		...(opts.junctions ? { junctions: opts.junctions } : {})
	};
}

/* ---------------------------------------------------------------- contexts for the single checks */

/** An issued report with no elements recorded (add them as a test needs). */
export const issuedReport = (elements: SnapshotElement[] = []): AuditReport => ({
	id: 'r1',
	number: 'R-1',
	revision: 1,
	issuedAt: '2024-03-01T10:00:00.000Z',
	snapshot: { elements }
});

/** The context a check sees for one element. */
export function contextOf(
	el: AuditElement,
	opts: { snapshot?: SnapshotElement; report?: AuditReport | null; limitTable?: LimitTableInfo | null } = {}
): ElementContext {
	return elementContext(
		el,
		opts.snapshot,
		opts.report === undefined ? null : opts.report,
		opts.limitTable === undefined ? TEST_LIMITS : opts.limitTable
	);
}

/** The context a check sees for layer `index` of an element (by default layer 1 of a front wall). */
export function layerOf(
	layer: StoredLayer,
	opts: { rev?: RevisionInfo; current?: RevisionInfo; index?: number; element?: AuditElement } = {}
): LayerContext {
	const el = opts.element ?? element('e1', [layer]);
	return layerContext(contextOf(el), opts.index ?? 0, layer, opts.rev, opts.current);
}

/** Outcome figures for a check, without the engine. */
export function outcome(over: Partial<Outcome> = {}): Outcome {
	return {
		u: 0.2,
		uRounded: 0.2,
		condensation: 'none',
		maxAccumulation: null,
		surfacePass: true,
		fRsi: 0.9,
		fRsiMin: 0.75,
		...over
	};
}
