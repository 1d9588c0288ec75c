/**
 * Temperatures and saturation vapour pressures of the vapour nodes in each month (ISO 13788:2012,
 * clause 6, with psat by Annex E), from the dimensionless temperatures of the heat solve.
 */
import type { GlaserChain, GlaserMonth } from './glaser-types';
import type { VapourNodes } from './glaser-nodes';
import { saturationPressure } from './moisture';

/** Per month (in the order given) and vapour node: temperature °C and saturation pressure Pa. */
export interface MonthlySaturation {
	temperature: number[][];
	saturationPressure: number[][];
}

/**
 * θ = θe + (θi − θe)·φ at every heat node of the month (°C), and psat(θ) by ISO 13788:2012,
 * Annex E (Pa). A vapour node of several heat nodes (joined by zero-sd elements) takes the lowest
 * saturation pressure of its members, and that member's temperature. Writes into `temperature`
 * and `psat`, one entry per vapour node.
 */
export function nodeSaturation(
	chain: GlaserChain,
	vn: VapourNodes,
	month: GlaserMonth,
	temperature: number[],
	psat: number[]
): void {
	const te = month.externalTemperature;
	const dT = month.internalTemperature - te;
	const { first, last } = vn;
	for (let g = 0; g < vn.count; g++) {
		let t = te + dT * chain.phi[first[g]];
		let ps = saturationPressure(t);
		for (let j = first[g] + 1; j <= last[g]; j++) {
			const tj = te + dT * chain.phi[j];
			const pj = saturationPressure(tj);
			if (pj < ps) {
				ps = pj;
				t = tj;
			}
		}
		temperature[g] = t;
		psat[g] = ps;
	}
}

/**
 * {@link nodeSaturation} for every month (°C, Pa). The arrays are also the months' reported
 * `temperature` and `saturationPressure`.
 */
export function monthlySaturation(
	chain: GlaserChain,
	vn: VapourNodes,
	months: readonly GlaserMonth[]
): MonthlySaturation {
	const nm = months.length;
	const temperature: number[][] = new Array(nm);
	const psat: number[][] = new Array(nm);
	for (let m = 0; m < nm; m++) {
		temperature[m] = new Array(vn.count);
		psat[m] = new Array(vn.count);
		nodeSaturation(chain, vn, months[m], temperature[m], psat[m]);
	}
	return { temperature, saturationPressure: psat };
}
