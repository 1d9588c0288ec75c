/**
 * The recalculations of an audit, pure: an element with the material revisions its assessor used, with
 * the library's current revisions, and the issued record with the revisions the report used. Each
 * identical engine input is calculated once per cache (the engine is a pure function).
 */
import {
	analyseElement,
	ElementInputError,
	type ElementInput,
	type ElementResult,
	type Layer
} from '$lib/physics';
import { toElementInput, type StoredLayer } from '$lib/dwellings/element-input';
import type { AuditElement, DwellingBundle, Outcome, RevisionInfo, SnapshotElement } from './types';

export type AnalysisCache = Map<string, Outcome | Error>;

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

/** The outcome of a window or door: its given U, nothing else. */
export function givenOutcome(u: number): Outcome {
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

/** What the report issued for an element: its calculated result, else its given U. */
export function issuedOutcome(snap: SnapshotElement | undefined): Outcome | null {
	if (!snap) return null;
	return outcomeOf(snap.result) ?? (snap.givenU != null ? givenOutcome(snap.givenU) : null);
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

function analyse(input: ElementInput, memo: AnalysisCache): Outcome {
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

/** Why a calculation failed, in words: each invalid field of the input, else the error's message. */
export function failure(e: unknown): string {
	if (e instanceof ElementInputError) return e.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
	return e instanceof Error ? e.message : String(e);
}

/** The library revisions of the layers of a build-up: the one each layer names, and its material's current one. */
export type LayerRevisions = {
	used: (i: number) => RevisionInfo | undefined;
	current: (i: number) => RevisionInfo | undefined;
	/** whether the library would give any layer other values: a current revision other than the one used */
	moved: () => boolean;
	/** whether any layer's named revision has been replaced by another current one */
	replaced: () => boolean;
};

export function layerRevisions(
	layers: StoredLayer[],
	b: Pick<DwellingBundle, 'revisions' | 'currentRevisions'>
): LayerRevisions {
	const used = (i: number) =>
		layers[i]?.materialRevisionId ? b.revisions.get(layers[i].materialRevisionId!) : undefined;
	const current = (i: number) => {
		const mid = layers[i]?.materialId ?? used(i)?.materialId;
		return mid ? b.currentRevisions.get(mid) : undefined;
	};
	return {
		used,
		current,
		moved: () => layers.some((_, i) => (current(i)?.id ?? used(i)?.id) !== used(i)?.id),
		replaced: () =>
			layers.some((_, i) => {
				const u = used(i);
				const c = current(i);
				return u && c && u.id !== c.id;
			})
	};
}

/**
 * An element's build-up recomputed with the revisions its assessor used (`used`, or `error` saying why
 * it failed) and with the library's current revisions (`current`: the same outcome when nothing moved,
 * null when that calculation fails).
 */
export function recomputeBuildUp(
	el: AuditElement,
	b: Pick<DwellingBundle, 'climateId' | 'climates'>,
	revs: LayerRevisions,
	cache: AnalysisCache
): { used: Outcome | null; current: Outcome | null; error?: string } {
	const climateId = el.climateId ?? b.climateId;
	const months = climateId ? (b.climates.get(climateId) ?? null) : null;
	const base = toElementInput({ heatFlow: el.heatFlow, buildUp: el.buildUp, internal: el.internal }, months);
	let used: Outcome | null = null;
	let error: string | undefined;
	try {
		used = analyse(withRevisions(base, revs.used), cache);
	} catch (e) {
		error = failure(e);
	}
	let current: Outcome | null;
	if (!revs.moved()) current = used;
	else {
		try {
			current = analyse(
				withRevisions(base, (i) => revs.current(i) ?? revs.used(i)),
				cache
			);
		} catch {
			current = null;
		}
	}
	return error === undefined ? { used, current } : { used, current, error };
}

/**
 * The issued record of an element recomputed with the revisions the report used: its stored engine
 * input, else one made from its stored build-up. `outcome` is null when the record has neither;
 * `error` is what the calculation threw.
 */
export function reproduceIssued(
	snap: SnapshotElement,
	revisions: Map<string, RevisionInfo>,
	cache: AnalysisCache
): { outcome: Outcome | null } | { error: unknown } {
	const snapLayers = snap.buildUp?.layers ?? [];
	const byIndex = new Map((snap.materialRevisions ?? []).map((m) => [m.layerIndex, m.revisionId]));
	const snapRev = (i: number) => {
		const id = byIndex.get(i) ?? snapLayers[i]?.materialRevisionId;
		return id ? revisions.get(id) : undefined;
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
		return { outcome: input ? analyse(withRevisions(input, snapRev), cache) : null };
	} catch (e) {
		return { error: e };
	}
}
