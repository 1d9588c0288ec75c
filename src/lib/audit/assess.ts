/**
 * The audit of one dwelling, pure: every element recomputed with today's engine, once with the material
 * revisions the assessor used and once with the library's current revisions, compared with the latest
 * issued dwelling report, and flagged. No I/O: the server module loads the rows, this decides.
 */
import {
	analyseElement,
	ElementInputError,
	ENGINE_VERSION,
	type ElementInput,
	type ElementResult,
	type Layer
} from '$lib/physics';
import {
	ELEMENT_KIND_LABELS,
	GIVEN_U_KINDS,
	type ElementKind,
	type MaterialCategory
} from '$lib/dwellings/kinds';
import {
	toElementInput,
	type ClimateMonthValues as ClimateMonthRow,
	type StoredBuildUp,
	type StoredInternal,
	type StoredLayer
} from '$lib/dwellings/element-input';
import type { Flag } from './flags';
import {
	MAX_INSULATION_LAYER_MM,
	PLAUSIBLE_GIVEN_U,
	PLAUSIBLE_LAMBDA,
	PLAUSIBLE_TOTAL_THICKNESS_MM,
	U_TOLERANCE,
	inRange
} from './plausible';

export type RevisionInfo = {
	id: string;
	materialId: string;
	code: string | null;
	revision: number;
	name: string;
	category: string;
	lambda: number | null;
	lambdaKind: string | null;
	resistance: number | null;
	muDry: number | null;
	sd: number | null;
	thicknessMinMm: number | null;
	thicknessMaxMm: number | null;
	status: string;
};

export type AuditElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: ElementInput['heatFlow'];
	buildUp: StoredBuildUp | null;
	givenU: number | null;
	givenUSource: string | null;
	internal: Partial<StoredInternal> | null;
	climateId: string | null;
};

export type SnapshotElement = {
	id: string;
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: ElementInput['heatFlow'];
	givenU?: number | null;
	givenUSource?: string | null;
	buildUp: StoredBuildUp | null;
	internal: Partial<StoredInternal> | null;
	climate: { id: string; months: ClimateMonthRow[] } | null;
	input: ElementInput | null;
	result: ElementResult | null;
	limit: number | null;
	pass: boolean | null;
	materialRevisions?: { layerIndex: number; materialId: string; revisionId: string; revision: number }[];
};

export type AuditReport = {
	id: string;
	number: string;
	revision: number;
	issuedAt: string;
	snapshot: { elements?: SnapshotElement[]; engineVersion?: string; issuedAt?: string };
};

export type LimitTableInfo = { name: string; edition: string; limits: Partial<Record<ElementKind, number>> };

export type DwellingBundle = {
	dwellingId: string;
	climateId: string | null;
	elements: AuditElement[];
	report: AuditReport | null;
	limitTable: LimitTableInfo | null;
	climates: Map<string, ClimateMonthRow[]>;
	revisions: Map<string, RevisionInfo>;
	/** material id → its current revision */
	currentRevisions: Map<string, RevisionInfo>;
};

/** The figures of one calculation that an auditor compares. */
export type Outcome = {
	u: number;
	uRounded: number;
	condensation: 'none' | 'dries' | 'accumulates' | null;
	maxAccumulation: number | null;
	surfacePass: boolean | null;
	fRsi: number | null;
	fRsiMin: number | null;
};

export type ElementRecompute = {
	elementId: string;
	name: string;
	kind: ElementKind;
	area: number;
	limit: number | null;
	givenU: number | null;
	issued: Outcome | null;
	used: Outcome | null;
	current: Outcome | null;
	reproduced: Outcome | null;
	inSnapshot: boolean;
	error?: string;
};

export type DwellingAudit = {
	engineVersion: string;
	reportId: string | null;
	reportNumber: string | null;
	reportRevision: number | null;
	issuedAt: string | null;
	limitTable: string | null;
	elements: ElementRecompute[];
	/** elements in the report that no longer exist */
	removedElements: { id: string; name: string; kind: ElementKind; issued: Outcome | null }[];
	flags: Flag[];
};

const fmtU = (u: number) => u.toFixed(3);
const kindLabel = (k: string) => ELEMENT_KIND_LABELS[k as ElementKind] ?? k;

export function outcomeOf(r: ElementResult | null | undefined): Outcome | null {
	if (!r || typeof r.uValue !== 'number') return null;
	return {
		u: r.uValue,
		uRounded: r.uValueRounded ?? r.uValue,
		condensation: r.condensation?.outcome ?? null,
		maxAccumulation: r.condensation?.maxAccumulation ?? null,
		surfacePass: r.surface ? r.surface.pass : null,
		fRsi: r.surface?.fRsi ?? null,
		fRsiMin: r.surface?.fRsiMin ?? null
	};
}

/** A layer's physical values taken from a library revision (thickness, air and bridging stay). */
export function layerFromRevision(layer: Layer, rev: RevisionInfo): Layer {
	const out: Layer = { ...layer };
	if (!layer.air) {
		if (rev.lambda !== null) {
			out.lambda = rev.lambda;
			delete out.resistance;
		} else if (rev.resistance !== null) {
			out.resistance = rev.resistance;
			delete out.lambda;
		}
	}
	if (rev.muDry !== null) {
		out.mu = rev.muDry;
		delete out.sd;
	} else if (rev.sd !== null) {
		out.sd = rev.sd;
		delete out.mu;
	}
	return out;
}

function withRevisions(
	input: ElementInput,
	revisionFor: (i: number) => RevisionInfo | undefined
): ElementInput {
	return {
		...input,
		layers: input.layers.map((l, i) => {
			const r = revisionFor(i);
			return r ? layerFromRevision(l, r) : l;
		})
	};
}

/** Canonical JSON (sorted keys) for comparing stored inputs. */
export function canonical(v: unknown): string {
	if (v === null || typeof v !== 'object') return JSON.stringify(v ?? null);
	if (Array.isArray(v)) return `[${v.map(canonical).join(',')}]`;
	const o = v as Record<string, unknown>;
	return `{${Object.keys(o)
		.filter((k) => o[k] !== undefined)
		.sort()
		.map((k) => `${JSON.stringify(k)}:${canonical(o[k])}`)
		.join(',')}}`;
}

const INSULATION_WORDS =
	/insulation|wool|fibre|fiber|quilt|batt|\bpir\b|\bpur\b|\beps\b|\bxps\b|phenolic|cellulose|foam/i;
const FRAMED_WORDS = /between|\bin(?: the)? (?:studs?|joists?|rafters?|frame)|stud (?:cavity|void)|infill/i;
const OVER_FRAME_WORDS = /across|over|above|under|below|outside/i;

function looksLikeInsulation(layer: StoredLayer, rev: RevisionInfo | undefined): boolean {
	if (rev) return rev.category === 'insulation';
	return INSULATION_WORDS.test(layer.name ?? '');
}

function different(a: number | null | undefined, b: number | null | undefined): boolean {
	if (a === undefined || a === null || b === undefined || b === null) return false;
	return Math.abs(a - b) > 1e-9 * Math.max(1, Math.abs(a), Math.abs(b));
}

type Memo = Map<string, Outcome | Error>;

function analyse(input: ElementInput, memo: Memo): Outcome {
	// native JSON is fast; a different key order only costs a second calculation, never a wrong one
	const key = JSON.stringify(input);
	const hit = memo.get(key);
	if (hit instanceof Error) throw hit;
	if (hit) return hit;
	try {
		const o = outcomeOf(analyseElement(input))!;
		memo.set(key, o);
		return o;
	} catch (e) {
		const err = e instanceof Error ? e : new Error(String(e));
		memo.set(key, err);
		throw err;
	}
}

function failure(e: unknown): string {
	if (e instanceof ElementInputError) return e.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
	return e instanceof Error ? e.message : String(e);
}

export type AnalysisCache = Map<string, Outcome | Error>;

/**
 * Recompute and flag one dwelling. `cache` may be shared across the dwellings of a batch: the engine is a
 * pure function, so an identical input (a build-up repeated from a template) is calculated once.
 */
export function auditDwelling(b: DwellingBundle, cache: AnalysisCache = new Map()): DwellingAudit {
	const flags: Flag[] = [];
	const report = b.report;
	const snapshotElements = new Map((report?.snapshot.elements ?? []).map((e) => [e.id, e]));
	const limits = b.limitTable?.limits ?? {};
	const tableName = b.limitTable ? `${b.limitTable.name} ${b.limitTable.edition}`.trim() : null;
	if (!report) {
		flags.push({
			code: 'not-issued',
			severity: 'high',
			reason: 'No dwelling report has been issued, so there are no issued numbers to check against.'
		});
	}

	const elements: ElementRecompute[] = [];
	// one flag per library revision and dwelling, naming every layer that uses it
	type Uses = Map<string, { rev: RevisionInfo; elementId: string; places: string[] }>;
	const unverified: Uses = new Map();
	const generic: Uses = new Map();
	const note = (m: Uses, rev: RevisionInfo, elementId: string, place: string) => {
		const e = m.get(rev.id) ?? { rev, elementId, places: [] };
		e.places.push(place);
		m.set(rev.id, e);
	};
	for (const el of b.elements) {
		const memo: Memo = cache;
		const snap = snapshotElements.get(el.id);
		const limit = typeof limits[el.kind] === 'number' ? limits[el.kind]! : null;
		const rec: ElementRecompute = {
			elementId: el.id,
			name: el.name,
			kind: el.kind,
			area: el.area,
			limit,
			givenU: el.givenU,
			issued: snap
				? (outcomeOf(snap.result) ?? (snap.givenU != null ? givenOutcome(snap.givenU) : null))
				: null,
			used: null,
			current: null,
			reproduced: null,
			inSnapshot: Boolean(snap)
		};
		const at = `${el.name} (${kindLabel(el.kind)})`;

		// ---- inputs changed after issue
		if (report) {
			if (!snap) {
				flags.push({
					code: 'stale-report',
					severity: 'medium',
					elementId: el.id,
					reason: `${at} was added after report ${report.number} was issued.`
				});
			} else {
				const changed: string[] = [];
				if (snap.kind !== el.kind) changed.push('kind');
				if (different(snap.area, el.area)) changed.push('area');
				if (snap.heatFlow !== el.heatFlow) changed.push('heat-flow direction');
				if (canonical(snap.buildUp ?? null) !== canonical(el.buildUp ?? null)) changed.push('build-up');
				if (canonical(snap.internal ?? null) !== canonical(el.internal ?? null))
					changed.push('internal conditions');
				if (el.buildUp && (snap.climate?.id ?? null) !== (el.climateId ?? b.climateId ?? null))
					changed.push('climate');
				if (different(snap.givenU ?? null, el.givenU) || (snap.givenU == null) !== (el.givenU == null))
					changed.push('given U-value');
				if (changed.length) {
					flags.push({
						code: 'stale-report',
						severity: 'medium',
						elementId: el.id,
						reason: `${at}: the ${changed.join(', ')} changed after report ${report.number} was issued; the report no longer describes the element.`
					});
				}
			}
		}

		// ---- windows and doors: a given U
		if (GIVEN_U_KINDS.includes(el.kind) || !el.buildUp) {
			if (el.givenU !== null) {
				rec.used = rec.current = givenOutcome(el.givenU);
				if (limit !== null && el.givenU > limit + 1e-9) {
					flags.push({
						code: 'u-over-limit',
						severity: 'high',
						elementId: el.id,
						reason: `${at}: the given U = ${el.givenU.toFixed(2)} W/(m²·K) is over the limit of ${limit} W/(m²·K)${tableName ? ` (${tableName})` : ''}.`
					});
				}
				if (!inRange(el.givenU, PLAUSIBLE_GIVEN_U)) {
					flags.push({
						code: 'thickness-implausible',
						severity: 'low',
						elementId: el.id,
						reason: `${at}: a given U of ${el.givenU} W/(m²·K) is outside the usual ${PLAUSIBLE_GIVEN_U.min}–${PLAUSIBLE_GIVEN_U.max} for windows and doors (${PLAUSIBLE_GIVEN_U.source}).`
					});
				}
			} else {
				rec.error = 'no build-up and no given U-value';
				flags.push({
					code: 'recompute-failed',
					severity: 'high',
					elementId: el.id,
					reason: `${at} has neither a build-up nor a given U-value.`
				});
			}
			elements.push(rec);
			continue;
		}

		const climateId = el.climateId ?? b.climateId;
		const months = climateId ? (b.climates.get(climateId) ?? null) : null;
		const base = toElementInput(
			{ heatFlow: el.heatFlow, buildUp: el.buildUp, internal: el.internal },
			months
		);
		const layers = el.buildUp.layers ?? [];
		const usedRev = (i: number) =>
			layers[i]?.materialRevisionId ? b.revisions.get(layers[i].materialRevisionId!) : undefined;
		const currentRev = (i: number) => {
			const mid = layers[i]?.materialId ?? usedRev(i)?.materialId;
			return mid ? b.currentRevisions.get(mid) : undefined;
		};

		try {
			rec.used = analyse(withRevisions(base, usedRev), memo);
		} catch (e) {
			rec.error = failure(e);
			flags.push({
				code: 'recompute-failed',
				severity: 'high',
				elementId: el.id,
				reason: `${at} could not be recomputed: ${rec.error}`
			});
		}
		const libraryMoved = layers.some((_, i) => (currentRev(i)?.id ?? usedRev(i)?.id) !== usedRev(i)?.id);
		if (!libraryMoved) rec.current = rec.used;
		else {
			try {
				rec.current = analyse(
					withRevisions(base, (i) => currentRev(i) ?? usedRev(i)),
					memo
				);
			} catch {
				rec.current = null;
			}
		}

		// ---- the issued numbers, reproduced with the revisions the report used
		if (snap && snap.result) {
			const snapLayers = snap.buildUp?.layers ?? [];
			const byIndex = new Map((snap.materialRevisions ?? []).map((m) => [m.layerIndex, m.revisionId]));
			const snapRev = (i: number) => {
				const id = byIndex.get(i) ?? snapLayers[i]?.materialRevisionId;
				return id ? b.revisions.get(id) : undefined;
			};
			const snapMonths = snap.climate?.months ?? null;
			try {
				const input =
					snap.input ??
					(snap.buildUp
						? toElementInput(
								{ heatFlow: snap.heatFlow, buildUp: snap.buildUp, internal: snap.internal },
								snapMonths
							)
						: null);
				if (input) rec.reproduced = analyse(withRevisions(input, snapRev), memo);
			} catch (e) {
				flags.push({
					code: 'not-reproducing',
					severity: 'high',
					elementId: el.id,
					reason: `${at}: the input stored with report ${report!.number} no longer calculates: ${failure(e)}`
				});
			}
			const issued = rec.issued;
			if (issued && rec.reproduced) {
				const du = rec.reproduced.u - issued.u;
				if (Math.abs(du) > U_TOLERANCE) {
					flags.push({
						code: 'not-reproducing',
						severity: 'high',
						elementId: el.id,
						reason: `${at}: report ${report!.number} gives U = ${fmtU(issued.u)}; recomputed with the revisions it used, U = ${fmtU(rec.reproduced.u)} W/(m²·K) (difference ${du > 0 ? '+' : ''}${du.toFixed(3)}).`
					});
				} else if (
					issued.condensation &&
					rec.reproduced.condensation &&
					issued.condensation !== rec.reproduced.condensation
				) {
					flags.push({
						code: 'not-reproducing',
						severity: 'high',
						elementId: el.id,
						reason: `${at}: report ${report!.number} says the interstitial condensation outcome is "${issued.condensation}"; recomputed it is "${rec.reproduced.condensation}".`
					});
				}
			}
			if (issued && rec.current && Math.abs(rec.current.u - issued.u) > U_TOLERANCE) {
				const changedRevs = layers.some((_, i) => {
					const u = usedRev(i);
					const c = currentRev(i);
					return u && c && u.id !== c.id;
				});
				if (changedRevs) {
					flags.push({
						code: 'library-changed',
						severity: 'low',
						elementId: el.id,
						reason: `${at}: with the library's current revisions U would be ${fmtU(rec.current.u)} instead of the issued ${fmtU(issued.u)} W/(m²·K).`
					});
				}
			}
		}

		// ---- results against limits and moisture criteria (the assessor's entries, the revisions they used)
		if (rec.used) {
			if (limit !== null && rec.used.uRounded > limit + 1e-9) {
				flags.push({
					code: 'u-over-limit',
					severity: 'high',
					elementId: el.id,
					reason: `${at}: U = ${rec.used.uRounded.toFixed(2)} W/(m²·K) is over the limit of ${limit} W/(m²·K)${tableName ? ` (${tableName})` : ''}.`
				});
			}
			if (rec.used.condensation === 'accumulates') {
				flags.push({
					code: 'condensation-accumulates',
					severity: 'high',
					elementId: el.id,
					reason: `${at}: interstitial condensation builds up over the year and does not dry out (Glaser method, ISO 13788).`
				});
			}
			if (rec.used.surfacePass === false) {
				flags.push({
					code: 'surface-mould-risk',
					severity: 'high',
					elementId: el.id,
					reason: `${at}: the temperature factor fRsi = ${rec.used.fRsi?.toFixed(3)} is below the ${rec.used.fRsiMin?.toFixed(3)} needed to avoid surface mould (ISO 13788).`
				});
			}
		}

		// ---- layer checks
		let total = 0;
		let anyBridge = false;
		const insulationLayers: number[] = [];
		layers.forEach((layer, i) => {
			total += layer.thicknessMm ?? 0;
			if (layer.bridge) anyBridge = true;
			const rev = usedRev(i);
			const lname = `${at}, layer ${i + 1} "${layer.name}"`;
			if (layer.materialRevisionId && !rev) {
				flags.push({
					code: 'material-unverified',
					severity: 'medium',
					elementId: el.id,
					layerIndex: i,
					reason: `${lname} names a library revision that is not in the library.`
				});
			}
			if (rev) {
				const code = rev.code ? `${rev.code} ` : '';
				if (rev.status === 'unverified') note(unverified, rev, el.id, `${el.name} layer ${i + 1}`);
				const cur = currentRev(i);
				if (rev.status === 'superseded' || (cur && cur.id !== rev.id)) {
					const now =
						cur && cur.id !== rev.id
							? `; the current revision is ${cur.revision}${cur.lambda !== null ? ` (λ ${cur.lambda})` : ''}`
							: '';
					flags.push({
						code: 'material-superseded',
						severity: 'medium',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname} uses ${code}revision ${rev.revision}${rev.lambda !== null ? ` (λ ${rev.lambda})` : ''}, which has been superseded${now}.`
					});
				}
				if (rev.category === 'insulation' && rev.lambdaKind === 'table')
					note(generic, rev, el.id, `${el.name} layer ${i + 1}`);
				const diffs: string[] = [];
				if (!layer.air && rev.lambda !== null && different(layer.lambda, rev.lambda))
					diffs.push(`λ ${layer.lambda} instead of ${rev.lambda}`);
				if (
					!layer.air &&
					rev.lambda === null &&
					rev.resistance !== null &&
					different(layer.resistance, rev.resistance)
				)
					diffs.push(`R ${layer.resistance} instead of ${rev.resistance}`);
				if (rev.muDry !== null && different(layer.mu, rev.muDry))
					diffs.push(`μ ${layer.mu} instead of ${rev.muDry}`);
				if (diffs.length) {
					flags.push({
						code: 'values-differ-from-revision',
						severity: 'medium',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname}: ${diffs.join(', ')} of ${code}revision ${rev.revision}; the entered values were changed by hand.`
					});
				}
				if (rev.thicknessMinMm !== null && layer.thicknessMm < rev.thicknessMinMm) {
					flags.push({
						code: 'thickness-implausible',
						severity: 'medium',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname} is ${layer.thicknessMm} mm; ${code}is supplied from ${rev.thicknessMinMm} mm.`
					});
				} else if (rev.thicknessMaxMm !== null && layer.thicknessMm > rev.thicknessMaxMm) {
					flags.push({
						code: 'thickness-implausible',
						severity: 'medium',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname} is ${layer.thicknessMm} mm; ${code}is supplied up to ${rev.thicknessMaxMm} mm.`
					});
				}
			}
			const category = (rev?.category ??
				(looksLikeInsulation(layer, rev) ? 'insulation' : null)) as MaterialCategory | null;
			const range = category ? PLAUSIBLE_LAMBDA[category] : undefined;
			if (range && typeof layer.lambda === 'number' && !layer.air && !inRange(layer.lambda, range)) {
				flags.push({
					code: 'lambda-implausible',
					severity: 'medium',
					elementId: el.id,
					layerIndex: i,
					reason: `${lname}: λ = ${layer.lambda} W/(m·K) is outside ${range.min}–${range.max} W/(m·K), the plausible range for ${category} (${range.source}).`
				});
			}
			if (looksLikeInsulation(layer, rev)) {
				insulationLayers.push(i);
				if (layer.thicknessMm > MAX_INSULATION_LAYER_MM) {
					flags.push({
						code: 'thickness-implausible',
						severity: 'medium',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname} is ${layer.thicknessMm} mm of insulation, more than the ${MAX_INSULATION_LAYER_MM} mm that is plausible in one layer (common practice, no source).`
					});
				}
				if (
					!layer.bridge &&
					FRAMED_WORDS.test(layer.name ?? '') &&
					!OVER_FRAME_WORDS.test(layer.name ?? '')
				) {
					flags.push({
						code: 'framed-without-bridging',
						severity: 'high',
						elementId: el.id,
						layerIndex: i,
						reason: `${lname} sits between framing members but was entered without bridging; the studs, joists or rafters make U worse (ISO 6946 combined method).`
					});
				}
			}
		});
		const framedElement = el.kind === 'pitched-roof-rafters' || /timber[ -]?frame|\bstud/i.test(el.name);
		if (
			framedElement &&
			!anyBridge &&
			insulationLayers.length > 0 &&
			!flags.some((f) => f.code === 'framed-without-bridging' && f.elementId === el.id)
		) {
			flags.push({
				code: 'framed-without-bridging',
				severity: 'high',
				elementId: el.id,
				reason: `${at} is a framed construction but no layer is bridged; enter the framing as a bridge in the insulation layer between the members (ISO 6946 combined method).`
			});
		}
		const tr = PLAUSIBLE_TOTAL_THICKNESS_MM[el.kind];
		if (tr && layers.length > 0 && !inRange(total, tr)) {
			flags.push({
				code: 'thickness-implausible',
				severity: 'medium',
				elementId: el.id,
				reason: `${at} is ${Math.round(total)} mm thick in total; ${tr.min}–${tr.max} mm is plausible for this kind of element (${tr.source}).`
			});
		}
		elements.push(rec);
	}

	const where = (p: string[]) =>
		p.length === 1 ? p[0] : `${p.slice(0, -1).join(', ')} and ${p[p.length - 1]}`;
	for (const { rev, elementId, places } of unverified.values()) {
		flags.push({
			code: 'material-unverified',
			severity: 'medium',
			elementId,
			reason: `${rev.code ? `${rev.code} ` : ''}"${rev.name}" revision ${rev.revision}, used in ${where(places)}, has not been verified against its source.`
		});
	}
	for (const { rev, elementId, places } of generic.values()) {
		flags.push({
			code: 'generic-lambda',
			severity: 'low',
			elementId,
			reason: `${rev.code ? `${rev.code} ` : ''}"${rev.name}", used in ${where(places)}, carries a generic table λ (${rev.lambda} W/(m·K)) for an insulation product; a declared value from the product's documentation is expected.`
		});
	}
	const current = new Set(b.elements.map((e) => e.id));
	const removedElements = [...snapshotElements.values()]
		.filter((s) => !current.has(s.id))
		.map((s) => ({ id: s.id, name: s.name, kind: s.kind, issued: outcomeOf(s.result) }));
	for (const r of removedElements) {
		flags.push({
			code: 'stale-report',
			severity: 'medium',
			reason: `${r.name} (${kindLabel(r.kind)}) is in report ${report!.number} but has since been removed from the dwelling.`
		});
	}

	return {
		engineVersion: ENGINE_VERSION,
		reportId: report?.id ?? null,
		reportNumber: report?.number ?? null,
		reportRevision: report?.revision ?? null,
		issuedAt: report?.issuedAt ?? null,
		limitTable: tableName,
		elements,
		removedElements,
		flags
	};
}

function givenOutcome(u: number): Outcome {
	return {
		u,
		uRounded: u,
		condensation: null,
		maxAccumulation: null,
		surfacePass: null,
		fRsi: null,
		fRsiMin: null
	};
}
