/**
 * Vapour pressures and the flux balance of one month along its vapour-pressure line (ISO
 * 13788:2012, clause 6): between consecutive vertices the finite-element kernel with g = δ0/sd
 * gives the pressure at every heat node and the flux; at an interior vertex, flux in minus flux
 * out is its condensation rate (negative: evaporation).
 */
import type { VapourNodes } from './glaser-nodes';
import type { GlaserWork } from './glaser-work';
import { solveSeries } from './series';

/**
 * From the `vertices` vertices of the month's line (work.vertex, work.vertexPressure, Pa): the
 * vapour pressure of every heat node into work.pressure (Pa; every member of a vapour node at the
 * node's pressure) and the rate of every vapour node into work.rate, kg/(m²·s): flux in − flux out
 * at each interior vertex (ISO 13788:2012, clause 6), 0 elsewhere. The fluxes through the first
 * and the last segment, into the construction at the internal surface and out of it at the
 * external surface, go into work.fluxIn and work.fluxOut, kg/(m²·s).
 */
export function pressuresAndRates(vn: VapourNodes, vertices: number, work: GlaserWork): void {
	const { first, last, conductance } = vn;
	const { vertex, vertexPressure, pressure, rate, series } = work;
	for (let g = 0; g < vn.count; g++) rate[g] = 0;
	for (let j = first[0]; j <= last[0]; j++) pressure[j] = vertexPressure[0];
	let fluxIn = 0;
	for (let q = 0; q + 1 < vertices; q++) {
		const u = vertex[q];
		const v = vertex[q + 1];
		const flux = solveSeries(
			conductance,
			last[u],
			first[v],
			vertexPressure[q],
			vertexPressure[q + 1],
			pressure,
			series
		);
		for (let j = first[v]; j <= last[v]; j++) pressure[j] = vertexPressure[q + 1];
		if (q > 0) rate[u] = fluxIn - flux;
		else work.fluxIn = flux;
		fluxIn = flux;
	}
	work.fluxOut = fluxIn;
}
