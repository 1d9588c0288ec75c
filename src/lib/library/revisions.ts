/**
 * Layers of an element point at a material revision and carry a copy of its values. These pure helpers
 * turn a newer revision into an explicit, reviewable update of a stored build-up.
 */
import type { FieldChange } from './schema';

/** The part of a stored layer this module reads and writes (see the build-up contract). */
export type StoredLayerLike = {
	name?: string;
	lambda?: number;
	resistance?: number;
	mu?: number;
	sd?: number;
	materialId?: string;
	materialRevisionId?: string;
	materialCode?: string;
	[key: string]: unknown;
};
export type BuildUpLike = { rsi?: number; rse?: number; layers: StoredLayerLike[]; [key: string]: unknown };

/** The values of a revision that are copied into a layer. */
export type LayerValues = {
	id: string;
	revision: number;
	code: string;
	name: string;
	lambda: number | null;
	resistance: number | null;
	muDry: number | null;
	sd: number | null;
};

export type RevisionUpdate = {
	layerIndex: number;
	materialId: string;
	fromRevisionId: string;
	toRevisionId: string;
	fromRevision: number;
	toRevision: number;
	changes: FieldChange[];
	/** the revision's values, to copy into the layer */
	to: LayerValues;
};

/** Copy a revision's values into a layer: λ or a fixed R, μ (dry) or sd; other layer settings stay. */
export function layerFromRevision(
	layer: StoredLayerLike,
	rev: LayerValues,
	materialId: string
): StoredLayerLike {
	const next: StoredLayerLike = { ...layer };
	delete next.lambda;
	delete next.resistance;
	delete next.mu;
	delete next.sd;
	if (rev.lambda != null) next.lambda = rev.lambda;
	if (rev.resistance != null) next.resistance = rev.resistance;
	if (rev.muDry != null) next.mu = rev.muDry;
	if (rev.sd != null) next.sd = rev.sd;
	next.materialId = materialId;
	next.materialRevisionId = rev.id;
	next.materialCode = rev.code;
	if (!layer.name || layer.name === layer.materialCode || layer.name === '') next.name = rev.name;
	return next;
}

/** A new build-up with the given updates applied; the input is not changed. */
export function applyRevisionUpdate<B extends BuildUpLike>(
	buildUp: B,
	updates: Pick<RevisionUpdate, 'layerIndex' | 'materialId' | 'fromRevisionId' | 'to'>[]
): B {
	const layers = buildUp.layers.map((l) => ({ ...l }));
	for (const u of updates) {
		const layer = layers[u.layerIndex];
		if (!layer) throw new Error(`layer ${u.layerIndex} does not exist in this build-up`);
		if (layer.materialId !== u.materialId || layer.materialRevisionId !== u.fromRevisionId) {
			throw new Error(`layer ${u.layerIndex} no longer points at the revision this update was made for`);
		}
		layers[u.layerIndex] = layerFromRevision(layer, u.to, u.materialId);
	}
	return { ...buildUp, layers };
}
