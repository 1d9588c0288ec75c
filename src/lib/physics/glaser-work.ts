/**
 * Scratch space of the Glaser cycle, allocated once per run and reused month by month (the
 * cycle runs on every keystroke of the editor).
 */
import type { SeriesWork } from './series';

/**
 * A plain array of n zeros (plain arrays are far cheaper to allocate than small typed ones). A
 * helper of the implementation, not a step of the method (no clause, no unit).
 */
export function zeros(n: number): number[] {
	const a = new Array<number>(n);
	for (let i = 0; i < n; i++) a[i] = 0;
	return a;
}

/** Scratch arrays of one run; "per vapour node" arrays have one entry per vapour node. */
export interface GlaserWork {
	/** the finite-element kernel's sweep coefficients */
	series: SeriesWork;
	/** vapour pressure at every heat node of the month, Pa */
	pressure: number[];
	/** fixed and touching vapour nodes of the month's line, in order (vertices) */
	vertex: number[];
	/** vapour pressure at each vertex, Pa */
	vertexPressure: number[];
	/** the hull's stack of vapour nodes */
	stack: number[];
	/** the points the line is drawn under: pi, psat of the interior nodes, pe; Pa */
	ceiling: number[];
	/** condensation (+) or evaporation (−) rate of the month per vapour node, kg/(m²·s) */
	rate: number[];
	/** amount held per vapour node, carried from month to month, kg/m² */
	amount: number[];
	/**
	 * amount held per vapour node at the start of the first month in which an interface dries out
	 * (while none has: of the last month that started with something held), kg/m²; where the
	 * conserving cycle resumes
	 */
	startAmount: number[];
	/** vapour flux of the month's line into the construction at the internal surface, kg/(m²·s) */
	fluxIn: number;
	/** vapour flux of the month's line out of the construction at the external surface, kg/(m²·s) */
	fluxOut: number;
}

/**
 * Scratch space for a chain of `heatNodes` heat nodes and `vapourNodes` vapour nodes, all zero;
 * units as listed in {@link GlaserWork}. Not a step of the method (no clause).
 */
export function createGlaserWork(heatNodes: number, vapourNodes: number): GlaserWork {
	return {
		series: { c: zeros(heatNodes) },
		pressure: zeros(heatNodes),
		vertex: zeros(vapourNodes),
		vertexPressure: zeros(vapourNodes),
		stack: zeros(vapourNodes),
		ceiling: zeros(vapourNodes),
		rate: zeros(vapourNodes),
		amount: zeros(vapourNodes),
		startAmount: zeros(vapourNodes),
		fluxIn: 0,
		fluxOut: 0
	};
}
