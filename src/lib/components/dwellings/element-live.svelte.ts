/**
 * The live result: the element's fields checked and computed in the page while the person types,
 * the same way the server computes them on save.
 */
import { untrack } from 'svelte';
import { analyseElement, type ElementInput, type ElementResult } from '$lib/physics';
import { toElementInput, type StoredBuildUp, type StoredInternal } from '$lib/dwellings/element-input';
import { validateElement } from '$lib/dwellings/schema';
import type { ClimateOption, ElementFieldValues } from './element-draft.svelte';
import type { Issue } from './element-issues';

export type Live = {
	issues: Issue[];
	result: ElementResult | null;
	input: ElementInput | null;
	/** the build-up as it would be stored (layers with their density and specific heat) */
	buildUp?: StoredBuildUp | null;
};
type Months = ClimateOption['months'];

/** Issues, or the result with the engine input it came from (none for a window or door). */
export function computeLive(f: ElementFieldValues, months: Months | null): Live {
	const checked = validateElement(f, months);
	if (!checked.ok) return { issues: checked.issues, result: null, input: null };
	if (!checked.data.buildUp) return { issues: [], result: null, input: null };
	const input = toElementInput(
		{
			heatFlow: checked.data.heatFlow ?? 'horizontal',
			buildUp: checked.data.buildUp as StoredBuildUp,
			internal: checked.data.internal as StoredInternal
		},
		months
	);
	try {
		return {
			issues: [],
			result: analyseElement(input),
			input,
			buildUp: checked.data.buildUp as StoredBuildUp
		};
	} catch (e) {
		return { issues: [{ path: '(input)', message: (e as Error).message }], result: null, input: null };
	}
}

/**
 * Recomputes whenever the fields or the climate change: at once when the page opens, then lightly
 * debounced, calling `onedit` for each change after the first. Create while the component is being set up.
 */
export class LiveResult {
	current: Live = $state({ issues: [], result: null, input: null });

	constructor(fields: () => ElementFieldValues, months: () => Months | null, onedit: () => void) {
		let first = true;
		let timer: ReturnType<typeof setTimeout> | undefined;
		$effect(() => {
			const f = $state.snapshot(fields()) as ElementFieldValues;
			const m = months();
			clearTimeout(timer);
			if (first) {
				first = false;
				this.current = computeLive(f, m);
				return;
			}
			untrack(onedit);
			// Light debounce: the engine takes about a millisecond, typing is the limit.
			timer = setTimeout(() => (this.current = computeLive(f, m)), 60);
		});
	}
}
