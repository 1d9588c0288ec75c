/**
 * Bounds of the two-dimensional junction input and of its mesh: this product's own choices, each
 * far beyond a real junction model, so that no accepted input can exhaust memory or time. None is
 * a number of a standard, except the convergence criterion, which names its source.
 */

/** Most regions of material (a detailed junction has a few dozen). */
export const JUNCTION_REGIONS_MAX = 200;
/** Most boundary segments. */
export const JUNCTION_BOUNDARIES_MAX = 400;
/** Most environments. */
export const JUNCTION_ENVIRONMENTS_MAX = 20;
/** Most flanking elements. */
export const JUNCTION_FLANKS_MAX = 20;
/** Most probe points. */
export const JUNCTION_PROBES_MAX = 1000;
/** Coordinates lie within ±20 m (a model of a junction extends a few metres). */
export const JUNCTION_COORD_MAX_MM = 20000;
/** Coordinates are taken to the nearest 0.001 mm, so that floating-point noise makes no sliver. */
export const JUNCTION_COORD_STEP_MM = 0.001;
/** λ range, W/(m·K): from still air in a vacuum panel (≈ 0.004) to copper and beyond. */
export const JUNCTION_LAMBDA_MIN = 1e-3;
export const JUNCTION_LAMBDA_MAX = 1e4;
/** Surface resistance range, m²·K/W; below RS_NEGLIGIBLE it is taken as zero (fixed temperature). */
export const JUNCTION_RS_MAX = 10;
export const JUNCTION_RS_NEGLIGIBLE = 1e-6;
/** Environment temperatures, °C. */
export const JUNCTION_TEMPERATURE_MIN = -100;
export const JUNCTION_TEMPERATURE_MAX = 1000;
/** Flank U-values, W/(m²·K), and lengths, mm. */
export const JUNCTION_U_MAX = 100;
export const JUNCTION_FLANK_LENGTH_MAX_MM = 100000;
/** Smallest accepted maxCellMm. */
export const JUNCTION_CELL_MIN_MM = 0.01;
/** Names of regions, flanks and environments. */
export const JUNCTION_NAME_MAX = 200;

/**
 * Most nodes of any mesh solved (about 50 MB of matrices and vectors, a few seconds on one core).
 * The refinement stops below it; an input whose coarsest mesh cannot be halved within it is refused.
 */
export const JUNCTION_NODES_MAX = 200000;
/** Most grid points (inside and outside the material) of a mesh, before any is allocated. */
export const JUNCTION_GRID_POINTS_MAX = 2000000;
/** Most blocks of the grid made by the regions' and boundaries' edges alone. */
export const JUNCTION_BLOCKS_MAX = 1000000;

/**
 * ISO 10211 (from memory): the number of subdivisions is sufficient when doubling it in each
 * direction changes the calculated heat flow by no more than 1 %.
 */
export const JUNCTION_REFINEMENT_CRITERION = 0.01;
/** The refinement always halves the coarsest mesh at least this often (no early chance agreement). */
export const JUNCTION_MIN_LEVEL = 2;
/** Cells of the coarsest mesh: the model's larger extent divided by this, unless maxCellMm is smaller. */
export const JUNCTION_COARSE_DIVISIONS = 16;
/** Grading: cells grow by at most this ratio away from every edge (geometric grading). */
export const JUNCTION_GROWTH = 1.5;
/** Grading: at an edge, cells start at most this fraction of the coarse size. */
export const JUNCTION_END_FRACTION = 0.25;
/** Conjugate gradients stop at ‖r‖ ≤ 10⁻¹⁰·‖b‖ (this product's choice, far below the mesh error). */
export const JUNCTION_SOLVER_TOLERANCE = 1e-10;
/** Most conjugate-gradient iterations per solve. */
export const JUNCTION_SOLVER_MAX_ITERATIONS = 20000;
