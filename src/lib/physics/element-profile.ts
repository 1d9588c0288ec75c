/**
 * Temperatures through the element at the design temperatures, from the dimensionless solution of
 * the heat chain: interface temperatures, per-layer results and the profile.
 */
import type { ElementInput, ElementResult, LayerResult } from './schema';
import type { ThermalModel } from './element-model';
import type { HeatChain } from './element-heat-chain';

/** Internal and external temperatures of the profile, °C. */
export interface DesignTemperatures {
	internal: number;
	external: number;
}

/**
 * Design temperatures of the profile, °C: as given, or the internal temperature (else 20 °C) and
 * the coldest climate month (else 0 °C). A note says where defaults came from.
 */
export function designTemperatures(input: ElementInput, notes: string[]): DesignTemperatures {
	if (input.designTemperatures) return input.designTemperatures;
	const coldest = input.climate?.reduce((a, c) => Math.min(a, c.temperature), Infinity);
	const design = {
		internal: input.internal?.temperature ?? 20,
		external: coldest !== undefined && Number.isFinite(coldest) ? coldest : 0
	};
	notes.push(
		`Profile at ${design.internal} °C inside (${input.internal ? 'internal temperature' : 'default'}) and ${design.external} °C outside (${coldest !== undefined ? 'coldest climate month' : 'default'}).`
	);
	return design;
}

/** The temperature part of the element result. */
export type TemperatureResults = Pick<ElementResult, 'interfaces' | 'layers' | 'profile'>;

/**
 * Temperatures θ = θe + (θi − θe)·φ, °C, at the design temperatures: every interface and the faces
 * of every layer (layers outside a well-ventilated air layer at θe), the per-layer results
 * (positions mm, resistances m²·K/W, sd m), and the profile through every node of the chain.
 */
export function temperatureResults(
	tm: ThermalModel,
	chain: HeatChain,
	phi: readonly number[],
	design: DesignTemperatures
): TemperatureResults {
	const { layers, active } = tm;
	const { endNode } = chain;
	const dT = design.internal - design.external;
	const tAt = (node: number) => design.external + dT * phi[node];

	const interfaces: { positionMm: number; temperature: number }[] = [{ positionMm: 0, temperature: tAt(1) }];
	const layerResults: LayerResult[] = [];
	for (let i = 0; i < layers.length; i++) {
		const m = layers[i];
		const tIn = i < active ? tAt(i === 0 ? 1 : endNode[i - 1]) : design.external;
		const tOut = i < active ? tAt(endNode[i]) : design.external;
		interfaces.push({ positionMm: m.endMm, temperature: tOut });
		layerResults.push({
			index: i,
			name: m.layer.name,
			thicknessMm: m.endMm - m.startMm,
			positionStartMm: m.startMm,
			positionEndMm: m.endMm,
			kind: m.kind,
			r: m.rPath,
			rBridge: m.rBridge,
			bridgeFraction: m.fraction,
			rEquivalent: m.rEquivalent,
			sd: m.sd,
			temperatureInside: tIn,
			temperatureOutside: tOut,
			disregarded: m.disregarded
		});
	}
	const profile: { positionMm: number; temperature: number }[] = [];
	for (let n = 1; n < chain.elements; n++)
		profile.push({ positionMm: chain.positionMm[n], temperature: tAt(n) });
	for (let i = active; i < layers.length; i++)
		profile.push({ positionMm: layers[i].endMm, temperature: design.external });
	return { interfaces, layers: layerResults, profile };
}
