/**
 * The bounds that keep the calculation safe: what the element input may hold (checked by
 * `parseElementInput`, ./schema and ./element-bounds) and the values below which a resistance or an
 * sd-value is taken as zero (./element-layers, ./element-films, ./element-heat-chain).
 *
 * None is a number of a standard: each lies far beyond any real building element, so that no real
 * input is refused, while every accepted input is analysed with finite numbers in a small, bounded
 * time and memory: the heat and Glaser chain has at most TOTAL_R_MAX/0.25 + LAYERS_MAX sublayers
 * (900), and no layer more than GLASER_SUBLAYERS_MAX (./element-heat-chain).
 */

/**
 * Largest thermal resistance of one layer (d/λ, or R as given), m²·K/W. Twice the resistance of
 * a metre of the best insulation (λ 0.02 W/(m·K): R = 50); real build-ups total under 20.
 */
export const LAYER_R_MAX = 100; // this product's bound, no source: far beyond any real layer

/** Largest sum of the layers' thermal resistances, m²·K/W (two layers at {@link LAYER_R_MAX}). */
export const TOTAL_R_MAX = 200; // this product's bound, no source: far beyond any real element

/**
 * Resistance below which a layer, a bridge or a given Rsi/Rse is taken as zero, m²·K/W. A 0.1 mm
 * aluminium foil (λ 160 W/(m·K)) has 6×10⁻⁷; the smallest real RT (two films) is over 0.1, so the
 * change is below 10⁻⁵ of U, while a conductance of 10¹⁸ beside one of 10 loses every digit of
 * the temperature solve.
 */
export const R_NEGLIGIBLE = 1e-6; // this product's bound, no source

/**
 * sd-value below which a layer is taken as vapour-open (sd = 0), m: 1 µm of still air. Vapour
 * conductances δ0/sd of 10²⁹⁰ beside 10⁻¹⁵ lose every digit of the vapour-pressure solve.
 */
export const SD_NEGLIGIBLE = 1e-6; // this product's bound, no source

/** Largest sd-value of one layer (given, or μ·d), m. Aluminium foil is commonly given 1500 m. */
export const LAYER_SD_MAX = 100000; // this product's bound, no source (common practice: foil ~1500 m)

/**
 * Largest vapour resistance factor μ. Metal foils are commonly given μ of 10⁵–3×10⁷ (sd 1500 m
 * at 0.05 mm); μ·d is also held to {@link LAYER_SD_MAX}.
 */
export const MU_MAX = 1e8; // this product's bound, no source (common practice: foils up to ~3×10⁷)

/** Thinnest layer, mm (1 µm: thinner than any foil or coating given as a layer). */
export const THICKNESS_MIN_MM = 0.001; // this product's bound, no source
/** Thickest layer, mm. */
export const THICKNESS_MAX_MM = 10000; // this product's bound, no source

/** Most layers in one build-up (the stored build-up allows 40). */
export const LAYERS_MAX = 100; // this product's bound, no source

/** Longest name of a layer or a bridging material, characters. */
export const NAME_MAX = 200; // this product's bound, no source

/** Largest width and centres of bridging members, mm. */
export const BRIDGE_SPACING_MAX_MM = 10000; // this product's bound, no source

/** Largest conductivity of a fastener, W/(m·K) (copper, the best common conductor, is about 400). */
export const FASTENER_LAMBDA_MAX = 1000; // this product's bound, no source (copper ~400, from memory)
/** Largest cross-section of one fastener, mm² (a bar 100 mm × 100 mm). */
export const FASTENER_AREA_MAX_MM2 = 10000; // this product's bound, no source
/** Most fasteners per m² (one per 1 cm²). */
export const FASTENERS_PER_M2_MAX = 10000; // this product's bound, no source

/**
 * Largest characteristic dimension of a floor on the ground, B′ = A/(0.5·P), m. A 100 m × 100 m
 * floor with one exposed side of 100 m has B′ = 200 m.
 */
export const CHARACTERISTIC_DIMENSION_MAX_M = 10000; // this product's bound, no source

/**
 * Difference θi − θe below which no heat is taken to flow for the temperature factor fRsi,min, K:
 * below it the factor (θsi,min − θe)/(θi − θe) is round-off over nothing (and overflows at 10⁻³⁰⁸).
 */
export const DT_NEGLIGIBLE_K = 1e-6; // this product's bound, no source

/** `v` as zero when it lies below `negligible` (and is not already zero). */
export const negligibleAsZero = (v: number, negligible: number): number => (v < negligible ? 0 : v);
