/** Method text and cautions of the two-dimensional junction calculation. */
import { fmt } from './note-format';
import { JUNCTION_REFINEMENT_CRITERION, JUNCTION_SOLVER_TOLERANCE } from './junction-bounds';

const PRECONDITIONERS: Record<string, string> = {
	multigrid:
		'a geometric multigrid V-cycle over the nested meshes (zebra line Gauss–Seidel smoothing in both directions, banded Cholesky on the coarsest mesh)',
	ic0: 'an incomplete Cholesky factor, IC(0)',
	jacobi: 'the diagonal (Jacobi)'
};

const pct = (v: number): string => `${fmt(v * 100, 3)} %`;

/** How the result was computed, one sentence a line. */
export function methodText(change: number, preconditioner: string): string[] {
	return [
		'Steady-state two-dimensional heat conduction (ISO 10211), per metre of junction length; each material homogeneous and isotropic, in perfect thermal contact with its neighbours.',
		'Finite elements: bilinear quadrilaterals on a rectilinear mesh whose grid lines include every region edge and boundary-segment end, graded towards edges and corners.',
		'Surface resistances as convective (Robin) boundary terms with h = 1/Rs; an environment with Rs = 0 fixes its surface temperature. Edges not exposed to an environment are adiabatic.',
		`Linear system: conjugate gradients preconditioned by ${PRECONDITIONERS[preconditioner] ?? preconditioner}, to ‖r‖ ≤ ${JUNCTION_SOLVER_TOLERANCE.toExponential(0)}·‖b‖.`,
		`Mesh halved until L2D changes by no more than ${pct(JUNCTION_REFINEMENT_CRITERION)} (ISO 10211's criterion for the number of subdivisions, as recalled); the last halving changed it by ${pct(change)}.`,
		'Heat flows from each environment: through the surface resistance where Rs > 0, as the reaction of the fixed nodes where Rs = 0. L2D = Φ/(θi − θe); ψ = L2D − Σ Uj·lj; fRsi = (θsi,min − θe)/(θi − θe) on the surfaces of the warmest environment.'
	];
}

/** Cautions carried by every junction result. */
export const JUNCTION_CAUTIONS: readonly string[] = [
	'A steady-state calculation: it does not describe heat storage, moisture, air movement through or around the construction, solar gains or conductivities that change with temperature or moisture.',
	'Every edge of the material not given an environment is adiabatic: it must be a cut-off plane or a symmetry plane. ISO 10211 places cut-off planes at least 1 m from the central element, or at three times the flanking element’s thickness if that is more, or at a symmetry plane (as recalled); closer planes change L2D and ψ.',
	'ψ refers to the dimension system of the flank lengths as given (internal, overall internal or external dimensions). Use it only with lengths measured the same way in the heat-loss calculation.',
	'fRsi is for the surface resistances given. Surface-condensation and mould checks (ISO 13788) use Rsi = 0.25 m²·K/W on opaque internal surfaces (as recalled), heat-flow and ψ calculations the ISO 6946 values: the two need separate runs.',
	'Air layers and cavities must be modelled as materials of equivalent conductivity; an empty space inside the model is an adiabatic void.',
	'These results support, and do not replace, professional judgement. Check them against the local building codes and regulations, and against licensed practice, before relying on them.'
];

export const cautionNotMet = (change: number, nodes: number): string =>
	`The mesh could not be refined to meet the ${pct(JUNCTION_REFINEMENT_CRITERION)} criterion within the node limit: the last halving (to ${nodes} nodes) still changed L2D by ${pct(change)}. Treat L2D and ψ as approximate.`;

export const CAUTION_FIXED_CONFLICT =
	'Two fixed-temperature boundaries (Rs = 0) of different temperatures meet at a point: the heat flow there is unbounded in theory, so the heat flows grow as the mesh is refined. Give one of them a surface resistance for a meaningful L2D.';

export const CAUTION_MANY_TEMPERATURES =
	'The boundaries face more than two temperatures: L2D here is the heat flow from the warmest environments over the difference between the warmest and the coldest, not a coupling coefficient between two environments (ISO 10211 derives those from one calculation per environment).';

export const cautionSolver = (residual: number, balance: number): string =>
	`The linear system could not be solved accurately (relative residual ${residual.toExponential(1)}, heat flows balancing to ${balance.toExponential(1)} of the largest): conductivities or sizes too far apart for double precision. The results may be inaccurate.`;
