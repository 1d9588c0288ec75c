/**
 * Monthly interstitial-condensation cycle by the Glaser method, ISO 13788:2012 clause 6
 * (clause numbers as recalled).
 *
 * Input is a chain of vapour nodes from the internal surface (node 0) to the external surface
 * (node N): the sublayers of every layer (each R ≤ 0.25 m²·K/W), their sd-values and the
 * dimensionless temperature φ = (θ − θe)/(θi − θe) of every node from the heat solve.
 * Nodes joined by a zero-sd element share one vapour pressure and are handled as one
 * vapour node ("group"); its saturation pressure is the lowest of its members.
 *
 * Each month: the vapour-pressure line runs from pi to pe, held at psat at every interface that
 * is still wet from earlier months, and is drawn taut under the saturation pressures (the lower
 * convex hull of the points between fixed nodes), so that it touches psat at the condensation
 * interfaces. Between the touching and fixed nodes, pressures and fluxes come from the
 * finite-element kernel with g = δ0/sd. The difference between the flux in and the flux out of a
 * touching node is its condensation rate (negative: evaporation), taken over the month's length.
 */

import { solveSeries, type SeriesWork } from './series';
import { DELTA_0, saturationPressure } from './moisture';

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

const SECONDS_PER_DAY = 86400;
/** amounts below this are taken as zero, kg/m² (10⁻⁶ g/m²) */
const ZERO_AMOUNT = 1e-9;
/** a rate below this is no condensation, kg/(m²·s) */
const ZERO_RATE = 1e-16;

/** A plain array of n zeros (plain arrays are far cheaper to allocate than small typed ones). */
function zeros(n: number): number[] {
	const a = new Array<number>(n);
	for (let i = 0; i < n; i++) a[i] = 0;
	return a;
}

/**
 * Run the twelve-month Glaser cycle (ISO 13788:2012, clause 6). `months` must hold the twelve
 * calendar months in order 1 … 12. The cycle starts in the first month in which condensation is
 * predicted (for a dry construction) after a month in which it is not; accumulation is carried
 * from month to month and never falls below zero. Amounts in g/m², pressures in Pa.
 */
export function runGlaser(chain: GlaserChain, months: readonly GlaserMonth[]): GlaserResult {
	const n = chain.elements;
	const nn = n + 1;
	const nm = months.length;
	const x = zeros(nn);
	const gv = zeros(nn);
	for (let e = 0; e < n; e++) {
		const sd = chain.sd[e];
		x[e + 1] = x[e] + sd;
		gv[e] = sd > 0 ? DELTA_0 / sd : Infinity;
	}
	if (!(x[n] > 0)) throw new RangeError('the total sd-value of the element is zero');

	// Vapour nodes: runs of heat nodes joined by zero-sd elements.
	const gStart: number[] = [0];
	const gEnd: number[] = [];
	for (let e = 0; e < n; e++) {
		if (gv[e] !== Infinity) {
			gEnd.push(e);
			gStart.push(e + 1);
		}
	}
	gEnd.push(n);
	const G = gStart.length;

	const nodes: GlaserNode[] = new Array(G);
	const gx = zeros(G);
	for (let g = 0; g < G; g++) {
		const last = gEnd[g];
		gx[g] = x[gStart[g]];
		nodes[g] = {
			index: g,
			positionMm: chain.positionMm[last],
			positionStartMm: chain.positionMm[gStart[g]],
			sdM: gx[g],
			layerIndex: chain.layerIndex[last],
			kind: g === 0 ? 'internal-surface' : g === G - 1 ? 'external-surface' : chain.kind[last]
		};
	}

	// Temperature and saturation pressure of every vapour node in every month (the coldest member
	// of a group sets its saturation pressure). These arrays are also the monthly results.
	const monthT: number[][] = new Array(nm);
	const monthPs: number[][] = new Array(nm);
	for (let m = 0; m < nm; m++) {
		const mo = months[m];
		const te = mo.externalTemperature;
		const dT = mo.internalTemperature - te;
		const tArr: number[] = new Array(G);
		const pArr: number[] = new Array(G);
		for (let g = 0; g < G; g++) {
			let t = te + dT * chain.phi[gStart[g]];
			let ps = saturationPressure(t);
			for (let j = gStart[g] + 1; j <= gEnd[g]; j++) {
				const tj = te + dT * chain.phi[j];
				const pj = saturationPressure(tj);
				if (pj < ps) {
					ps = pj;
					t = tj;
				}
			}
			tArr[g] = t;
			pArr[g] = ps;
		}
		monthT[m] = tArr;
		monthPs[m] = pArr;
	}

	const work: SeriesWork = { c: zeros(nn) };
	const pNode = zeros(nn);
	const vert = zeros(G);
	const vertP = zeros(G);
	const stack = zeros(G);
	const hy = zeros(G);
	const rate = zeros(G);
	const ma = zeros(G);

	/**
	 * The taut vapour-pressure line of one month: fills `vert`/`vertP` with the fixed and touching
	 * vapour nodes in order and returns their number. Wet groups (ma > 0) are held at saturation.
	 */
	const hull = (m: number, wet: boolean): number => {
		const mo = months[m];
		const ps = monthPs[m];
		let nv = 0;
		vert[nv] = 0;
		vertP[nv] = mo.internalVapourPressure;
		nv++;
		hy[0] = mo.internalVapourPressure;
		for (let g = 1; g < G - 1; g++) hy[g] = ps[g];
		hy[G - 1] = mo.externalVapourPressure;
		let a = 0;
		for (let b = 1; b < G; b++) {
			if (b < G - 1 && !(wet && ma[b] > 0)) continue;
			// Lower convex hull of (x, y) between the fixed groups a and b (monotone chain). A point
			// is kept only if it lies below the chord of its neighbours by more than a round-off margin;
			// the test is written without division: (y_mid − y_o)(x_k − x_o) < (y_k − y_o)(x_mid − x_o).
			let sp = 0;
			stack[sp++] = a;
			for (let k = a + 1; k <= b; k++) {
				const yk = hy[k];
				const xk = gx[k];
				while (sp >= 2) {
					const o = stack[sp - 2];
					const mid = stack[sp - 1];
					const xo = gx[o];
					const yo = hy[o];
					const ym = hy[mid];
					const span = xk - xo;
					if ((ym - yo) * span >= (yk - yo) * (gx[mid] - xo) - 1e-9 * (Math.abs(ym) + 1) * span) sp--;
					else break;
				}
				stack[sp++] = k;
			}
			for (let q = 1; q < sp; q++) {
				const v = stack[q];
				vert[nv] = v;
				vertP[nv] = hy[v];
				nv++;
			}
			a = b;
		}
		return nv;
	};

	/** Pressures at every node and rates (kg/(m²·s)) at the vertices, from the kernel between vertices. */
	const pressures = (nv: number): void => {
		for (let g = 0; g < G; g++) rate[g] = 0;
		for (let j = gStart[0]; j <= gEnd[0]; j++) pNode[j] = vertP[0];
		let fluxIn = 0;
		for (let q = 0; q + 1 < nv; q++) {
			const u = vert[q];
			const v = vert[q + 1];
			const flux = solveSeries(gv, gEnd[u], gStart[v], vertP[q], vertP[q + 1], pNode, work);
			for (let j = gStart[v]; j <= gEnd[v]; j++) pNode[j] = vertP[q + 1];
			if (q > 0) rate[u] = fluxIn - flux;
			fluxIn = flux;
		}
	};

	// Dry-start check of every month. For a dry construction the taut line touches some node exactly
	// when a saturation pressure lies below the straight line from pi to pe (the lower hull of the
	// points then has a corner), and a touching node is a convex corner where more vapour arrives
	// than leaves: condensation. So one pass against the straight line decides it.
	const dry: boolean[] = new Array(nm);
	let anyDry = false;
	let allDry = true;
	const xEnd = gx[G - 1];
	for (let m = 0; m < nm; m++) {
		const mo = months[m];
		const ps = monthPs[m];
		const pi = mo.internalVapourPressure;
		const slope = (mo.externalVapourPressure - pi) / xEnd;
		let c = false;
		for (let g = 1; g < G - 1; g++) {
			const line = pi + slope * gx[g];
			if (ps[g] < line - 1e-9 * (Math.abs(ps[g]) + 1)) {
				c = true;
				break;
			}
		}
		dry[m] = c;
		anyDry ||= c;
		allDry &&= c;
	}
	let start = 0;
	if (anyDry && !allDry) {
		for (let m = 0; m < nm; m++) {
			if (dry[m] && !dry[(m + nm - 1) % nm]) {
				start = m;
				break;
			}
		}
	}

	const results: GlaserMonthResult[] = new Array(nm);
	const condensationMonths: number[] = [];
	const surfaceCondensationMonths: number[] = [];
	let maxAccumulation = 0;
	let peakMonth: number | null = null;
	let maxAtInterface = 0;
	let maxAtInterfaceNode: number | null = null;
	let profileMonth = -1;
	let profileCondensed = 0;
	let profileP: number[] | null = null;
	let total = 0;
	let wetCount = 0;

	for (let c = 0; c < nm; c++) {
		const m = (start + c) % nm;
		const mo = months[m];
		const seconds = mo.days * SECONDS_PER_DAY;
		// Nothing wet and nothing touching: the straight line, without building the hull.
		if (wetCount === 0 && !dry[m]) {
			vert[0] = 0;
			vertP[0] = mo.internalVapourPressure;
			vert[1] = G - 1;
			vertP[1] = mo.externalVapourPressure;
			pressures(2);
		} else pressures(hull(m, true));
		const vp: number[] = new Array(G);
		const rt: number[] = new Array(G);
		const acc: number[] = new Array(G);
		let condensed = 0;
		let evaporated = 0;
		let formed = false;
		total = 0;
		wetCount = 0;
		for (let g = 0; g < G; g++) {
			const r = rate[g];
			const amount = r * seconds;
			const before = ma[g];
			let after = before + amount;
			if (after < ZERO_AMOUNT) after = 0;
			ma[g] = after;
			if (r > ZERO_RATE) {
				condensed += amount;
				formed = true;
			} else if (amount < 0) {
				evaporated += before - after;
			}
			total += after;
			if (after > 0) wetCount++;
			vp[g] = pNode[gStart[g]];
			rt[g] = amount * 1000;
			acc[g] = after * 1000;
			if (after * 1000 > maxAtInterface) {
				maxAtInterface = after * 1000;
				maxAtInterfaceNode = g;
			}
		}
		if (formed) condensationMonths.push(mo.month);
		if (mo.internalVapourPressure > monthPs[m][0]) surfaceCondensationMonths.push(mo.month);
		if (total * 1000 > maxAccumulation) {
			maxAccumulation = total * 1000;
			peakMonth = mo.month;
		}
		if (condensed > profileCondensed) {
			profileCondensed = condensed;
			profileMonth = m;
			profileP = pNode.slice();
		}
		results[m] = {
			month: mo.month,
			days: mo.days,
			externalTemperature: mo.externalTemperature,
			externalVapourPressure: mo.externalVapourPressure,
			internalTemperature: mo.internalTemperature,
			internalVapourPressure: mo.internalVapourPressure,
			temperature: monthT[m],
			saturationPressure: monthPs[m],
			vapourPressure: vp,
			rate: rt,
			accumulatedAt: acc,
			accumulated: total * 1000,
			condensed: condensed * 1000,
			evaporated: evaporated * 1000
		};
	}
	condensationMonths.sort((p, q) => p - q);
	surfaceCondensationMonths.sort((p, q) => p - q);

	// Vapour profile for charting: the month with the most condensation formed, else the coldest month.
	if (profileP === null) {
		profileMonth = 0;
		for (let m = 1; m < nm; m++)
			if (months[m].externalTemperature < months[profileMonth].externalTemperature) profileMonth = m;
		pressures(hull(profileMonth, false));
		profileP = pNode;
	}
	const pm = months[profileMonth];
	const points: VapourProfilePoint[] = new Array(nn);
	for (let j = 0; j < nn; j++) {
		const t = pm.externalTemperature + (pm.internalTemperature - pm.externalTemperature) * chain.phi[j];
		points[j] = {
			positionMm: chain.positionMm[j],
			sdM: x[j],
			temperature: t,
			saturationPressure: saturationPressure(t),
			vapourPressure: profileP[j]
		};
	}

	const outcome: GlaserResult['outcome'] = !anyDry ? 'none' : total * 1000 > 0 ? 'accumulates' : 'dries';
	return {
		nodes,
		startMonth: anyDry ? months[start].month : null,
		months: results,
		maxAccumulation,
		peakMonth,
		maxAtInterface,
		maxAtInterfaceNode,
		evaporatesFully: outcome !== 'accumulates',
		condensationMonths,
		outcome,
		surfaceCondensationMonths,
		vapourProfile: { month: pm.month, points },
		condensesEveryMonth: allDry
	};
}
