/**
 * Layers whose library material has a newer revision than the one the element was saved with.
 * Checked once when the page opens; kept by the editor, so the list outlives a switch of kind.
 */
import { untrack } from 'svelte';
import type { StoredBuildUp } from '$lib/dwellings/element-input';
import type { MaterialValues } from './element-draft.svelte';

export type NewerRevision = {
	layerIndex: number;
	materialId: string;
	toRevisionId: string;
	fromRevision: number;
	toRevision: number;
	changes: { field: string; from: unknown; to: unknown }[];
};

export class MaterialRevisions {
	newer: NewerRevision[] = $state([]);

	/** Create while the component is being set up: the check runs in the page, once it has opened. */
	constructor(savedBuildUp: () => StoredBuildUp | null | undefined) {
		$effect(() => {
			const b = untrack(savedBuildUp);
			if (!b || !b.layers.some((l) => l.materialRevisionId)) return;
			fetch('/api/v1/materials/revision-check', {
				method: 'POST',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ buildUp: b })
			})
				.then((r) => (r.ok ? r.json() : null))
				.then((out) => {
					const list = Array.isArray(out) ? out : (out?.items ?? out?.updates ?? []);
					this.newer = list as NewerRevision[];
				})
				.catch(() => {});
		});
	}

	/** Fetch the newer revision and hand its values to `apply`; the offer goes once a layer took them. */
	async use(n: NewerRevision, apply: (layerIndex: number, m: MaterialValues) => boolean) {
		const res = await fetch(`/api/v1/materials/${n.materialId}`);
		if (!res.ok) return;
		if (!apply(n.layerIndex, await res.json())) return;
		this.newer = this.newer.filter((x) => x !== n);
	}
}
