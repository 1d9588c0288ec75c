/**
 * Elements recomputed as the element service would store them after a move to another material revision:
 * the same engine input (`toElementInput` of the build-up, heat flow, inside conditions, area and the
 * climate that applies, as `calculateElement` in the element service makes it) and the same engine
 * (`analyseElement`).
 *
 * The engine is a pure function of its input, so an outcome is kept by the input's SHA-256 and the engine
 * version (`material_reach_outcomes`): each distinct input is calculated once, the first time any reach
 * needs it, and read back after that. A new engine version calculates everything again. Self-contained
 * (the Knex instance passed in) so the benchmark can run it outside SvelteKit.
 */
import { createHash } from 'node:crypto';
import type { Db } from '$lib/server/db';
import {
	analyseElement,
	ElementInputError,
	ENGINE_VERSION,
	type ElementInput,
	type ElementResult,
	type HeatFlow
} from '$lib/physics';
import {
	toElementInput,
	type ClimateMonthValues,
	type StoredBuildUp,
	type StoredInternal
} from '$lib/dwellings/element-input';

import type { ReachOutcome } from '$lib/library/reach';
export type { ReachOutcome };

/** An outcome, or why the engine refused the input. */
export type Computed = { outcome: ReachOutcome } | { error: string };

/** The headline figures of an engine result. */
export function outcomeOf(r: ElementResult): ReachOutcome {
	return {
		u: r.uValue,
		uRounded: r.uValueRounded ?? r.uValue,
		moisture: r.condensation?.outcome ?? null,
		surfacePass: r.surface ? r.surface.pass : null
	};
}

/** Why a calculation failed, in words: each field of the input at fault, else the error's message. */
function failure(e: unknown): string {
	if (e instanceof ElementInputError) return e.issues.map((i) => `${i.path}: ${i.message}`).join('; ');
	return e instanceof Error ? e.message : String(e);
}

/** Calculate one engine input. */
export function compute(input: ElementInput): Computed {
	try {
		return { outcome: outcomeOf(analyseElement(input)) };
	} catch (e) {
		return { error: failure(e) };
	}
}

/**
 * The engine input of an element with the given build-up and the climate months that apply to it (the
 * element's own climate, else its dwelling's; none: no moisture checks), with the key it is kept by.
 */
export function engineInput(
	el: { heatFlow: HeatFlow; buildUp: StoredBuildUp; internal: StoredInternal | null; area: number },
	months: ClimateMonthValues[] | null
): { key: string; input: ElementInput } {
	const input = toElementInput(el, months);
	// jsonb gives keys in one order and the layer update is deterministic, so the same input gives the
	// same text; a different order would only cost a second calculation, never a wrong one
	const key = createHash('sha256').update(JSON.stringify(input)).digest('hex');
	return { key, input };
}

type OutcomeRow = {
	input_key: string;
	u_value: number | null;
	u_rounded: number | null;
	moisture: ReachOutcome['moisture'];
	surface_pass: boolean | null;
	error: string | null;
};

const fromRow = (r: OutcomeRow): Computed =>
	r.error !== null
		? { error: r.error }
		: { outcome: { u: r.u_value, uRounded: r.u_rounded, moisture: r.moisture, surfacePass: r.surface_pass } };

const toRow = (organisationId: string, key: string, c: Computed) => ({
	organisation_id: organisationId,
	engine_version: ENGINE_VERSION,
	input_key: key,
	u_value: 'outcome' in c ? c.outcome.u : null,
	u_rounded: 'outcome' in c ? c.outcome.uRounded : null,
	moisture: 'outcome' in c ? c.outcome.moisture : null,
	surface_pass: 'outcome' in c ? c.outcome.surfacePass : null,
	error: 'error' in c ? c.error.slice(0, 2000) : null
});

/**
 * The outcome of each input, by key: read from the kept outcomes of this engine version, the rest
 * calculated now and kept. `stats` counts what was read and what was calculated.
 */
export async function outcomesFor(
	k: Db,
	organisationId: string,
	inputs: Map<string, ElementInput>,
	stats: { kept: number; calculated: number } = { kept: 0, calculated: 0 }
): Promise<Map<string, Computed>> {
	const out = new Map<string, Computed>();
	if (inputs.size === 0) return out;
	const { rows } = await k.raw(
		`SELECT input_key, u_value, u_rounded, moisture, surface_pass, error FROM material_reach_outcomes
		  WHERE organisation_id = ? AND engine_version = ? AND input_key = ANY(?::text[])`,
		[organisationId, ENGINE_VERSION, [...inputs.keys()]]
	);
	for (const r of rows as OutcomeRow[]) out.set(r.input_key, fromRow(r));
	stats.kept += out.size;
	const fresh: ReturnType<typeof toRow>[] = [];
	for (const [key, input] of inputs) {
		if (out.has(key)) continue;
		const c = compute(input);
		out.set(key, c);
		fresh.push(toRow(organisationId, key, c));
	}
	stats.calculated += fresh.length;
	for (let i = 0; i < fresh.length; i += 1000) {
		await k('material_reach_outcomes')
			.insert(fresh.slice(i, i + 1000))
			.onConflict(['organisation_id', 'engine_version', 'input_key'])
			.ignore();
	}
	return out;
}

/** Forget the outcomes of other engine versions (they are never read again). */
export async function pruneOutcomes(k: Db): Promise<number> {
	return k('material_reach_outcomes').whereNot('engine_version', ENGINE_VERSION).delete();
}
