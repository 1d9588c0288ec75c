/**
 * From a junction's stored choices to its calculation, the one way the page's worker and the server
 * both take: the model is built from the dwelling's elements (builder) or taken as entered
 * (free-form), checked, and computed with the dwelling's climate.
 */
import { parseJunctionInput, JunctionInputError } from '$lib/physics/junction';
import type { JunctionInput } from '$lib/physics/junction-schema';
import type { FieldSampling, JunctionField } from '$lib/physics/junction-field';
import {
	toEngineLayer,
	DEFAULT_EXTERNAL_TEMPERATURE,
	type ClimateMonthValues,
	type StoredBuildUp
} from '$lib/dwellings/element-input';
import type { HeatFlow } from '$lib/physics';
import type { FieldIssue } from '$lib/validation';
import type { DimensionSystem, JunctionType } from './kinds';
import type { JunctionDetails, JunctionInternal } from './schema';
import { buildJunction, type BuilderElement, type BuilderType } from './builder';
import { calculateJunction, type JunctionCalculation } from './calculate';
import { DEFAULT_JUNCTION_INTERNAL } from './surface';
import type { Box } from './builder-shapes';

/** An element of the dwelling as stored (the fields the builder reads). */
export interface ElementLike {
	id: string;
	name: string;
	kind: string;
	heatFlow: HeatFlow;
	buildUp: StoredBuildUp | null;
	givenU: number | null;
	version?: number;
}

/** The builder's view of a stored element: engine layers, a window's U, the ground's λ, a roof space. */
export function toBuilderElement(e: ElementLike): BuilderElement {
	return {
		id: e.id,
		name: e.name,
		kind: e.kind,
		heatFlow: e.heatFlow,
		layers: (e.buildUp?.layers ?? []).map(toEngineLayer),
		givenU: e.givenU,
		groundLambda: e.buildUp?.ground?.groundLambda,
		roofSpace: e.buildUp?.roofSpace
	};
}

/**
 * Design temperatures of a built model: the inside temperature, and the climate's coldest month
 * (else −5 °C, as elements take it) when it is colder than inside by 1 K or more (ψ and fRsi do
 * not depend on them; the picture's temperatures do).
 */
export function designTemperatures(internal: JunctionInternal, months: readonly ClimateMonthValues[] | null) {
	const coldest = months?.length
		? Math.min(...months.map((m) => m.temperature))
		: DEFAULT_EXTERNAL_TEMPERATURE;
	const outside = coldest <= internal.temperature - 1 ? coldest : DEFAULT_EXTERNAL_TEMPERATURE;
	return { inside: internal.temperature, outside: Math.min(outside, internal.temperature - 1) };
}

export interface RunRequest {
	type: JunctionType;
	dimensionSystem: DimensionSystem;
	details: JunctionDetails;
	/** the free-form model (mode free-form) */
	model?: unknown;
	/** the dwelling's elements */
	elements: ElementLike[];
	months: ClimateMonthValues[] | null;
	field?: FieldSampling;
}

export type RunOutcome =
	| { ok: true; model: JunctionInput; result: JunctionCalculation; field?: JunctionField }
	| { ok: false; issues: FieldIssue[] };

/** The view and a margin of 6 % of its larger side (the picture's own margin), or undefined. */
function margin(view: Box | undefined): Box | undefined {
	if (!view) return undefined;
	const m = 0.06 * Math.max(view.x1 - view.x0, view.y1 - view.y0);
	return { x0: view.x0 - m, y0: view.y0 - m, x1: view.x1 + m, y1: view.y1 + m };
}

const prefixed = (issues: FieldIssue[], prefix: string): FieldIssue[] =>
	issues.map((i) => ({ path: i.path === '(input)' ? prefix : `${prefix}.${i.path}`, message: i.message }));

function elementOf(req: RunRequest, key: 'a' | 'b'): { el: ElementLike | null; issue?: FieldIssue } {
	const id = req.details.elements[key];
	if (!id) return { el: null };
	const el = req.elements.find((e) => e.id === id);
	return el
		? { el }
		: { el: null, issue: { path: `details.elements.${key}`, message: 'is not an element of this dwelling' } };
}

/** Build (or take) the model and calculate it; issues name the field at fault. */
export function runJunction(req: RunRequest): RunOutcome {
	const internal = req.details.internal ?? DEFAULT_JUNCTION_INTERNAL;
	let model: JunctionInput;
	let extra: Pick<Parameters<typeof calculateJunction>[0], 'flanksBySystem' | 'glazing' | 'view' | 'notes'> =
		{};
	const used: ElementLike[] = [];
	if (req.details.mode === 'builder') {
		const a = elementOf(req, 'a');
		const b = elementOf(req, 'b');
		const missing = [a.issue, b.issue].filter((i): i is FieldIssue => Boolean(i));
		if (missing.length) return { ok: false, issues: missing };
		const built = buildJunction({
			type: req.type as BuilderType,
			elements: { a: a.el && toBuilderElement(a.el), b: b.el && toBuilderElement(b.el) },
			details: req.details,
			dimensionSystem: req.dimensionSystem,
			temperatures: designTemperatures(internal, req.months)
		});
		if (!built.ok) return built;
		model = built.built.model;
		extra = {
			flanksBySystem: built.built.flanksBySystem,
			glazing: built.built.glazing,
			view: built.built.view,
			notes: built.built.notes
		};
		used.push(...[a.el, b.el].filter((e): e is ElementLike => e !== null));
	} else {
		const parsed = parseJunctionInput(req.model);
		if (!parsed.ok) return { ok: false, issues: prefixed(parsed.issues, 'model') };
		model = parsed.data;
	}
	try {
		const { result, field } = calculateJunction({
			model,
			dimensionSystem: req.dimensionSystem,
			internal,
			months: req.months,
			field: req.field && { ...req.field, window: req.field.window ?? margin(extra.view) },
			...extra
		});
		if (used.length)
			result.elements = [
				...new Map(used.map((e) => [e.id, { id: e.id, name: e.name, version: e.version ?? null }])).values()
			];
		return { ok: true, model, result, ...(field ? { field } : {}) };
	} catch (e) {
		if (e instanceof JunctionInputError) return { ok: false, issues: prefixed(e.issues, 'model') };
		throw e;
	}
}
