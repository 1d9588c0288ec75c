/**
 * Corrections to the U-value, ISO 6946:2017 Annex F (numbering as recalled; Annex D in the 2007 edition).
 */

/** ΔU'' for air gaps by correction level 0, 1, 2, W/(m²·K). */
export const AIR_GAP_DELTA_U2 = [0, 0.01, 0.04] as const; // ISO 6946:2017, Table F.1

/** α for a fastener that fully penetrates the insulation layer. */
export const FASTENER_ALPHA = 0.8; // ISO 6946:2017, F.3.2

/** Fasteners whose conductivity is below this need no correction, W/(m·K). */
export const FASTENER_LAMBDA_EXEMPT = 1; // ISO 6946:2017, F.3.1

/** Corrections totalling less than this fraction of U need not be applied. */
export const CORRECTION_OMIT_FRACTION = 0.03; // ISO 6946:2017, 7 (and Annex F introduction)

/**
 * Air-gap correction ΔUg = ΔU''·(R1/RT)², W/(m²·K) (ISO 6946:2017, F.2), with R1 the thermal
 * resistance of the layer containing the gaps and RT the total resistance of the element, both m²·K/W.
 */
export function airGapCorrection(level: 0 | 1 | 2, r1: number, rTotal: number): number {
	const ratio = r1 / rTotal;
	return AIR_GAP_DELTA_U2[level] * ratio * ratio;
}

export interface Fasteners {
	/** thermal conductivity of the fastener, W/(m·K) */
	lambda: number;
	/** cross-sectional area of one fastener, mm² */
	areaMm2: number;
	/** number of fasteners per m² */
	perM2: number;
	/** length of the fastener inside the insulation layer, mm (defaults to the layer thickness) */
	penetrationMm?: number;
}

/**
 * Mechanical-fastener correction ΔUf = α·λf·Af·nf/d0 · (R1/RT,h)², W/(m²·K) (ISO 6946:2017, F.3.2):
 * α = 0.8 for a fastener through the whole insulation layer, 0.8·d1/d0 when recessed;
 * λf in W/(m·K), Af in m² (given in mm²), nf per m², d0 the insulation thickness in m (given in mm),
 * R1 the resistance of the insulation layer and RT,h the element total ignoring thermal bridges (m²·K/W).
 * Zero when λf < 1 W/(m·K) (F.3.1).
 */
export function fastenerCorrection(
	f: Fasteners,
	d0Mm: number,
	r1: number,
	rTotalHomogeneous: number
): number {
	if (f.lambda < FASTENER_LAMBDA_EXEMPT || d0Mm <= 0) return 0;
	const d1 = Math.min(f.penetrationMm ?? d0Mm, d0Mm);
	const alpha = FASTENER_ALPHA * (d1 / d0Mm);
	const ratio = r1 / rTotalHomogeneous;
	return ((alpha * f.lambda * (f.areaMm2 * 1e-6) * f.perM2) / (d0Mm / 1000)) * ratio * ratio;
}

/**
 * The omission rule of ISO 6946:2017 (clause 7): when the total correction ΔU is below 3 % of U
 * the corrections need not be applied. `mode` 'always' applies them regardless.
 * Returns whether ΔU is applied and the resulting U, W/(m²·K).
 */
export function applyCorrections(
	u: number,
	deltaU: number,
	mode: 'standard' | 'always' = 'standard'
): { applied: boolean; u: number } {
	if (deltaU <= 0) return { applied: false, u };
	if (mode === 'standard' && deltaU < CORRECTION_OMIT_FRACTION * u) return { applied: false, u };
	return { applied: true, u: u + deltaU };
}
