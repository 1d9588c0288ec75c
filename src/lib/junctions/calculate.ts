/**
 * A junction's calculation as Envelo stores and shows it: the ψ run (ISO 10211, ISO 6946 surface
 * resistances; L2D, ψ in each dimension system the flanks are known in) and the surface run
 * (ISO 13788's Rsi on the inside surfaces; fRsi, the coldest point, and optionally the temperature
 * field), the surface check against the climate's months, method, cautions and notes. Pure: the
 * page's worker and the server compute the same result from the same model.
 */
import { analyseJunction, type JunctionResult } from '$lib/physics/junction';
import { JUNCTION_CAUTIONS, methodText } from '$lib/physics/junction-text';
import { analyseJunctionField, type FieldSampling, type JunctionField } from '$lib/physics/junction-field';
import type { JunctionFlank, JunctionInput } from '$lib/physics/junction-schema';
import { ENGINE_VERSION, RSI_SURFACE_CHECK } from '$lib/physics';
import type { ClimateMonthValues } from '$lib/dwellings/element-input';
import { DIMENSION_SYSTEMS, DIMENSION_SYSTEM_LABELS, type DimensionSystem } from './kinds';
import type { JunctionInternal } from './schema';
import { surfaceModel } from './builder';
import { surfaceVerdict, type SurfaceVerdict } from './surface';
import type { Box } from './builder-shapes';

export interface CalculationRequest {
	model: JunctionInput;
	dimensionSystem: DimensionSystem;
	/** the flanks in every dimension system (builder); else the model's flanks are the chosen system's */
	flanksBySystem?: Record<DimensionSystem, JunctionFlank[]>;
	/** warm environments left out of the fRsi check (a window's panel) */
	glazing?: string[];
	internal: JunctionInternal;
	months: ClimateMonthValues[] | null;
	view?: Box;
	notes?: string[];
	field?: FieldSampling;
}

/** What is stored in `junctions.last_result` and shown beside the picture. */
export interface JunctionCalculation {
	engineVersion: string;
	dimensionSystem: DimensionSystem;
	/** ψ in the chosen dimension system, W/(m·K); null when the model has no flanks */
	psi: number | null;
	psiBySystem: Partial<Record<DimensionSystem, number>>;
	couplingCoefficient: number;
	flanks: JunctionFlank[];
	heatFlows: Record<string, number>;
	surface: SurfaceVerdict & {
		rsi: number;
		coldest: { x: number; y: number; temperature: number };
		/** the environments whose surfaces were checked */
		checked: string[];
		temperatures: { inside: number; outside: number };
		converged: boolean;
	};
	view: Box | null;
	method: string[];
	cautions: string[];
	notes: string[];
	/** the ψ run as the engine returned it (mesh, convergence, solver) */
	run: JunctionResult;
	/** the elements a built model came from, with the versions read */
	elements?: { id: string; name: string; version: number | null }[];
}

const flankSum = (flanks: JunctionFlank[]) => flanks.reduce((s, f) => s + (f.uValue * f.lengthMm) / 1000, 0);

function temperatures(model: JunctionInput) {
	const t = Object.values(model.environments).map((e) => e.temperature);
	return { inside: Math.max(...t), outside: Math.min(...t) };
}

/** Cautions of every junction's surface check (the engine's own come first in a result). */
export const SURFACE_CAUTIONS: readonly string[] = [
	`fRsi comes from a second run with Rsi = ${RSI_SURFACE_CHECK} m²·K/W on the inside surfaces (ISO 13788, as recalled); ψ from the run with ISO 6946 surface resistances. The monthly fRsi,min use monthly mean conditions: local air movement, furniture against the wall and curtains make surfaces colder.`,
	'The fRsi figure of 0.75 for dwellings is common practice with no source here; the national requirement, where there is one, decides.'
];

/** The cautions every junction result carries, whatever its model (a result may add its own). */
export const COMMON_JUNCTION_CAUTIONS: readonly string[] = [...JUNCTION_CAUTIONS, ...SURFACE_CAUTIONS];

/**
 * The method sentences every junction result carries word for word: those of the engine's method text
 * that depend on neither the solver used nor the mesh's last change (a result's others say those).
 */
export const COMMON_JUNCTION_METHOD: readonly string[] = (() => {
	const a = methodText(0, 'multigrid');
	const b = methodText(0.5, 'jacobi');
	return a.filter((line, i) => line === b[i]);
})();

/**
 * Compute a junction: both runs, ψ in each dimension system, and the surface check. Throws the
 * engine's JunctionInputError for a model it refuses.
 */
export function calculateJunction(req: CalculationRequest): {
	result: JunctionCalculation;
	field?: JunctionField;
} {
	const run = analyseJunction(req.model);
	const twin = surfaceModel(req.model, req.glazing ?? []);
	const surface = analyseJunctionField(twin.model, {
		surfaceEnvironments: twin.checked,
		...(req.field ? { sampleField: req.field } : {})
	});
	const psiBySystem: Partial<Record<DimensionSystem, number>> = {};
	if (req.flanksBySystem)
		for (const s of DIMENSION_SYSTEMS)
			psiBySystem[s] = run.couplingCoefficient - flankSum(req.flanksBySystem[s]);
	else if (run.psi !== undefined) psiBySystem[req.dimensionSystem] = run.psi;
	const psi = psiBySystem[req.dimensionSystem] ?? null;
	const fRsi = surface.fRsi ?? run.fRsi;
	const coldest = surface.coldest ?? run.coldest;
	const result: JunctionCalculation = {
		engineVersion: ENGINE_VERSION,
		dimensionSystem: req.dimensionSystem,
		psi,
		psiBySystem,
		couplingCoefficient: run.couplingCoefficient,
		flanks: req.flanksBySystem?.[req.dimensionSystem] ?? req.model.flanks ?? [],
		heatFlows: run.heatFlows,
		surface: {
			...surfaceVerdict(fRsi, req.internal, req.months),
			rsi: RSI_SURFACE_CHECK,
			coldest,
			checked: twin.checked,
			temperatures: temperatures(req.model),
			converged: surface.converged
		},
		view: req.view ?? null,
		method: [
			...run.method,
			`ψ refers to ${DIMENSION_SYSTEM_LABELS[req.dimensionSystem]}: use it with junction lengths measured the same way.`
		],
		cautions: [
			...run.cautions,
			...SURFACE_CAUTIONS,
			...(surface.converged
				? []
				: ['The surface run did not meet the mesh criterion: treat fRsi as approximate.'])
		],
		notes: [...(req.notes ?? []), ...run.notes],
		run
	};
	return { result, ...(surface.field ? { field: surface.field } : {}) };
}
