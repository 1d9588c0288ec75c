/**
 * Surface resistances of an element by heat-flow direction (ISO 6946:2017, 6.8 and Table 7), and
 * the rule for a well-ventilated air layer (6.9.4), which decides how many layers count.
 */
import { RSE, RSI } from './resistances';
import type { ElementInput } from './schema';

export interface SurfaceFilms {
	/** internal surface resistance Rsi, m²·K/W */
	rsi: number;
	/** external surface resistance Rse, m²·K/W */
	rse: number;
	/** number of layers that count: those inside the first well-ventilated air layer, else all */
	active: number;
}

/**
 * Rsi and Rse, m²·K/W: the conventional values for the heat-flow direction (ISO 6946:2017, 6.8,
 * Table 7) unless given. A well-ventilated air layer and every layer outside it are disregarded and
 * Rse takes the value of Rsi (6.9.4), unless Rse is given. Notes say which values apply and why.
 */
export function surfaceResistances(input: ElementInput, notes: string[]): SurfaceFilms {
	const dir = input.heatFlow;
	const rsi = input.rsi ?? RSI[dir];
	notes.push(
		input.rsi === undefined
			? `Rsi = ${rsi} m²·K/W for ${dir} heat flow (ISO 6946:2017, Table 7).`
			: `Rsi = ${rsi} m²·K/W as given (overrides ISO 6946).`
	);

	const well = input.layers.findIndex((l) => l.air === 'well-ventilated');
	if (well < 0) {
		const rse = input.rse ?? RSE;
		notes.push(
			input.rse === undefined
				? `Rse = ${rse} m²·K/W (ISO 6946:2017, Table 7).`
				: `Rse = ${rse} m²·K/W as given (overrides ISO 6946).`
		);
		return { rsi, rse, active: input.layers.length };
	}
	const rse = input.rse ?? rsi;
	notes.push(
		`Layer ${well + 1} is a well-ventilated air layer: it and the ${input.layers.length - well - 1} layer(s) outside it are disregarded and ` +
			(input.rse === undefined
				? `Rse takes the value of Rsi, ${rse} m²·K/W (ISO 6946:2017, 6.9.4).`
				: `Rse = ${rse} m²·K/W as given.`)
	);
	return { rsi, rse, active: well };
}
