/**
 * Input and output of the monthly Glaser cycle (ISO 13788:2012, clause 6): the chain of vapour
 * nodes, the months' boundary conditions, and the results per vapour node and month.
 * Pressures Pa, temperatures °C, amounts g/m², sd-values m, positions mm.
 */

export type NodeKind = 'internal-surface' | 'interface' | 'sublayer' | 'external-surface';

export interface GlaserChain {
	/** number of vapour elements (sublayers) N; nodes 0 … N */
	elements: number;
	/** position of each node from the internal surface, mm (length N + 1) */
	positionMm: ArrayLike<number>;
	/** sd-value of each element, m (length N) */
	sd: ArrayLike<number>;
	/** dimensionless temperature of each node, 1 = internal air, 0 = external air (length N + 1) */
	phi: ArrayLike<number>;
	/** index of the layer a node ends (or, for the internal surface, −1) (length N + 1) */
	layerIndex: ArrayLike<number>;
	/** kind of each node (length N + 1) */
	kind: readonly NodeKind[];
}

export interface GlaserMonth {
	month: number;
	days: number;
	externalTemperature: number;
	externalVapourPressure: number;
	internalTemperature: number;
	internalVapourPressure: number;
}

export interface GlaserNode {
	index: number;
	/** position of the (outermost) heat node of this vapour node, mm */
	positionMm: number;
	/** position of the innermost heat node, mm (differs only across zero-sd layers) */
	positionStartMm: number;
	/** cumulative sd from the internal surface, m */
	sdM: number;
	layerIndex: number;
	kind: NodeKind;
}

export interface GlaserMonthResult {
	month: number;
	days: number;
	externalTemperature: number;
	externalVapourPressure: number;
	internalTemperature: number;
	internalVapourPressure: number;
	/** per vapour node, in the order of `nodes`: temperature °C */
	temperature: number[];
	/** per vapour node: saturation pressure, Pa */
	saturationPressure: number[];
	/** per vapour node: vapour pressure, Pa */
	vapourPressure: number[];
	/** per vapour node: condensation (+) or evaporation (−) rate over the month, g/m² */
	rate: number[];
	/** per vapour node: amount at the end of the month, g/m² */
	accumulatedAt: number[];
	/** total at the end of the month over all interfaces, g/m² */
	accumulated: number;
	/** total formed in the month, g/m² */
	condensed: number;
	/** total evaporated in the month, g/m² */
	evaporated: number;
}

export interface VapourProfilePoint {
	positionMm: number;
	sdM: number;
	temperature: number;
	saturationPressure: number;
	vapourPressure: number;
}

export interface GlaserResult {
	nodes: GlaserNode[];
	/** calendar month the cycle starts (first month with condensation after one without), or null if none */
	startMonth: number | null;
	months: GlaserMonthResult[];
	maxAccumulation: number;
	peakMonth: number | null;
	maxAtInterface: number;
	maxAtInterfaceNode: number | null;
	evaporatesFully: boolean;
	condensationMonths: number[];
	outcome: 'none' | 'dries' | 'accumulates';
	/** months in which pi exceeds psat at the internal surface (surface condensation, outside Glaser) */
	surfaceCondensationMonths: number[];
	vapourProfile: { month: number; points: VapourProfilePoint[] };
	/** true when condensation is predicted with a dry start in every month (cycle starts in month 1) */
	condensesEveryMonth: boolean;
}

/**
 * The Glaser cycle kept in mass balance (glaser-conserving.ts): the standard's months (ISO
 * 13788:2012, clause 6) with each month split at the instant an interface dries out. Same meanings
 * and units as in {@link GlaserResult}; amounts g/m².
 */
export interface GlaserConservingResult {
	/** per calendar month, as in GlaserResult.months (vapour pressures of the month's last part) */
	months: GlaserMonthResult[];
	maxAccumulation: number;
	peakMonth: number | null;
	evaporatesFully: boolean;
	outcome: 'none' | 'dries' | 'accumulates';
	/** moisture created over the cycle, defined as in {@link GlaserMassBalance} (zero to round-off) */
	created: number;
}

/** The mass balance of the standard's monthly cycle, and the cycle that keeps it. */
export interface GlaserMassBalance {
	/**
	 * Moisture the standard's monthly steps created over the cycle, g/m²: the sum over its twelve
	 * months of (change in the total held over the month − (vapour flux in at the internal surface −
	 * vapour flux out at the external surface) × the month's length), which is the total held at
	 * the end of the cycle minus the net vapour flux over the year (the cycle starts dry). Positive
	 * when moisture appears from nothing (an interface held at saturation for the whole month after
	 * its stock is gone); amounts below 10⁻⁶ g/m² are taken as zero.
	 */
	created: number;
	conserving: GlaserConservingResult;
}
