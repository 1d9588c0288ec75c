/**
 * Thermally inhomogeneous (bridged) layers by the combined method of ISO 6946:2017, 6.7.2.
 *
 * Each layer is either homogeneous (one resistance) or bridged: a main material with resistance
 * `r` over the area fraction 1 − f and a bridging material with resistance `rBridge` over f.
 * With several bridged layers the sections are all combinations of "main" and "bridge" per
 * bridged layer, with fractions multiplied: bridges in different layers are taken to cross one
 * another (as battens laid across rafters), which is the usual reading when their patterns are
 * independent.
 */

export interface SeriesLayerR {
	/** resistance of the layer (homogeneous) or of its main material (bridged), m²·K/W */
	r: number;
	/** for a bridged layer: resistance of the bridging material across the same thickness, m²·K/W */
	rBridge?: number;
	/** for a bridged layer: area fraction of the bridging material, 0 < f < 1 */
	fraction?: number;
}

export interface CombinedResult {
	/** upper limit R'T, m²·K/W (ISO 6946:2017, 6.7.2.2) */
	rUpper: number;
	/** lower limit R''T, m²·K/W (ISO 6946:2017, 6.7.2.3) */
	rLower: number;
	/** RT = (R'T + R''T)/2, m²·K/W (ISO 6946:2017, 6.7.2.1) */
	rTotal: number;
	/** maximum relative error e = (R'T − R''T)/(2·RT) (ISO 6946:2017, 6.7.2.5) */
	relativeError: number;
	/** total through the main material of every layer (bridges ignored), m²·K/W */
	rClear: number;
	/** equivalent resistance of each layer used in the lower limit, m²·K/W */
	rEquivalent: number[];
	/** every section: area fraction and total resistance, m²·K/W */
	sections: { fraction: number; rTotal: number }[];
	bridged: boolean;
}

/** Largest number of bridged layers accepted (2^n sections). */
export const MAX_BRIDGED_LAYERS = 8;

/**
 * Combined method, ISO 6946:2017 6.7.2: upper limit 1/R'T = Σ fq/RTq over all sections (each from
 * environment to environment, with Rsi and Rse), lower limit R''T = Rsi + Σ Rj + Rse with
 * 1/Rj = Σ fq/Rqj for each bridged layer (equivalent conductivity), RT their mean, e the error.
 * All resistances in m²·K/W. For an element without bridged layers every value equals the series sum.
 */
export function combinedMethod(rsi: number, rse: number, layers: readonly SeriesLayerR[]): CombinedResult {
	const bridgedIdx: number[] = [];
	const rEquivalent: number[] = new Array(layers.length);
	let rClear = rsi + rse;
	let rLowerSum = rsi + rse;
	for (let i = 0; i < layers.length; i++) {
		const l = layers[i];
		rClear += l.r;
		if (l.fraction !== undefined && l.rBridge !== undefined) {
			bridgedIdx.push(i);
			const f = l.fraction;
			// 1/Rj = (1 − f)/R_main + f/R_bridge; a zero-resistance part gives Rj = 0.
			const inv = (l.r > 0 ? (1 - f) / l.r : Infinity) + (l.rBridge > 0 ? f / l.rBridge : Infinity);
			rEquivalent[i] = inv === Infinity ? 0 : 1 / inv;
		} else {
			rEquivalent[i] = l.r;
		}
		rLowerSum += rEquivalent[i];
	}
	if (bridgedIdx.length === 0) {
		return {
			rUpper: rClear,
			rLower: rClear,
			rTotal: rClear,
			relativeError: 0,
			rClear,
			rEquivalent,
			sections: [{ fraction: 1, rTotal: rClear }],
			bridged: false
		};
	}
	if (bridgedIdx.length > MAX_BRIDGED_LAYERS) {
		throw new RangeError(`at most ${MAX_BRIDGED_LAYERS} bridged layers are supported`);
	}
	const nSections = 1 << bridgedIdx.length;
	const sections: { fraction: number; rTotal: number }[] = new Array(nSections);
	let invUpper = 0;
	for (let s = 0; s < nSections; s++) {
		let fraction = 1;
		let r = rClear;
		for (let b = 0; b < bridgedIdx.length; b++) {
			const l = layers[bridgedIdx[b]];
			const f = l.fraction as number;
			if (s & (1 << b)) {
				fraction *= f;
				r += (l.rBridge as number) - l.r;
			} else {
				fraction *= 1 - f;
			}
		}
		sections[s] = { fraction, rTotal: r };
		invUpper += fraction / r;
	}
	const rUpper = 1 / invUpper;
	const rLower = rLowerSum;
	const rTotal = (rUpper + rLower) / 2;
	return {
		rUpper,
		rLower,
		rTotal,
		relativeError: (rUpper - rLower) / (2 * rTotal),
		rClear,
		rEquivalent,
		sections,
		bridged: true
	};
}

/** Bridging fraction from member width and centres (both mm): f = width / centres. */
export function bridgeFraction(widthMm: number, centresMm: number): number {
	return widthMm / centresMm;
}

/** Ratio R'T/R''T above which the combined method is outside its range (e > 20 %). */
export const COMBINED_METHOD_MAX_RATIO = 1.5; // ISO 6946:2017, 6.7.2.1 (scope of the method)
