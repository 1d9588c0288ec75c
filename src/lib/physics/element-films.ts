/**
 * Surface resistances of an element by heat-flow direction (ISO 6946:2017, 6.8 and Table 7), and
 * the rule for a well-ventilated air layer (6.9.4), which decides how many layers count.
 */
import { effectiveHeatFlow, HORIZONTAL_HEAT_FLOW_WITHIN_DEG, RSE, RSI, type HeatFlow } from './resistances';
import type { ElementInput } from './schema';
import { fmt } from './note-format';
import { R_NEGLIGIBLE } from './bounds';
import { hasConditions, surfaceFilms } from './surface-films';

export interface SurfaceFilms {
	/** internal surface resistance Rsi, m²·K/W */
	rsi: number;
	/** external surface resistance Rse, m²·K/W */
	rse: number;
	/** number of layers that count: those inside the first well-ventilated air layer, else all */
	active: number;
}

/**
 * A given surface resistance (m²·K/W) below {@link R_NEGLIGIBLE} taken as zero, with a note: it
 * changes nothing that can be reported, and its conductance would leave the solve no digits.
 */
function given(name: 'Rsi' | 'Rse', r: number, notes: string[]): number {
	if (r > 0 && r < R_NEGLIGIBLE) {
		notes.push(
			`${name} = ${r.toExponential(1)} m²·K/W is below ${R_NEGLIGIBLE} m²·K/W and is taken as zero.`
		);
		return 0;
	}
	return r;
}

/**
 * Why an inclined element takes the heat-flow direction it does (ISO 6946:2017, 6.8, note to Table 7,
 * from memory): the heat flows normal to the element, at 90° − inclination from the horizontal plane.
 */
function inclinationNote(inclinationDeg: number, dir: HeatFlow): string {
	const fromHorizontal = 90 - inclinationDeg;
	return (
		`The element is inclined ${fmt(inclinationDeg, 1)}° from the horizontal, so its heat flow runs ${fmt(fromHorizontal, 1)}° from the horizontal plane: ` +
		(dir === 'horizontal'
			? `within ±${HORIZONTAL_HEAT_FLOW_WITHIN_DEG}° of it, the values for horizontal heat flow apply (ISO 6946:2017, 6.8, note to Table 7).`
			: `more than ${HORIZONTAL_HEAT_FLOW_WITHIN_DEG}° from it, the values for ${dir} heat flow apply (ISO 6946:2017, 6.8, note to Table 7).`)
	);
}

/**
 * Rsi and Rse, m²·K/W: the conventional values for the heat-flow direction (ISO 6946:2017, 6.8,
 * Table 7; for an inclined element the direction its inclination gives) unless given. A well-ventilated air layer and every layer outside it are disregarded and
 * Rse takes the value of Rsi (6.9.4), unless Rse is given. Notes say which values apply and why; a
 * given value below {@link R_NEGLIGIBLE} is taken as zero.
 */
export function surfaceResistances(input: ElementInput, notes: string[]): SurfaceFilms {
	const dir = effectiveHeatFlow(input);
	if (input.inclinationDeg !== undefined) notes.push(inclinationNote(input.inclinationDeg, dir));
	// Other surface conditions (Annex C) replace the conventional value of the side they describe (the
	// inside emissivity Rsi; the outside emissivity or the wind speed Rse); a given Rsi or Rse still wins.
	const c = input.surfaceConditions;
	const films = hasConditions(c) ? surfaceFilms(dir, c) : null;
	const inside = films && c?.internalEmissivity !== undefined ? { r: films.rsi, note: films.notes[0] } : null;
	const outside =
		films && (c?.externalEmissivity !== undefined || c?.windSpeed !== undefined)
			? { r: films.rse, note: films.notes[1] }
			: null;
	notes.push(
		input.rsi !== undefined
			? `Rsi = ${input.rsi} m²·K/W as given (overrides ISO 6946).`
			: inside
				? inside.note
				: `Rsi = ${RSI[dir]} m²·K/W for ${dir} heat flow (ISO 6946:2017, Table 7).`
	);
	const rsi = input.rsi !== undefined ? given('Rsi', input.rsi, notes) : (inside?.r ?? RSI[dir]);

	const well = input.layers.findIndex((l) => l.air === 'well-ventilated');
	if (well < 0) {
		notes.push(
			input.rse !== undefined
				? `Rse = ${input.rse} m²·K/W as given (overrides ISO 6946).`
				: outside
					? outside.note
					: `Rse = ${RSE} m²·K/W (ISO 6946:2017, Table 7).`
		);
		const rse = input.rse !== undefined ? given('Rse', input.rse, notes) : (outside?.r ?? RSE);
		return { rsi, rse, active: input.layers.length };
	}
	notes.push(
		`Layer ${well + 1} is a well-ventilated air layer: it and the ${input.layers.length - well - 1} layer(s) outside it are disregarded and ` +
			(input.rse === undefined
				? `Rse takes the value of Rsi, ${fmt(rsi, 4)} m²·K/W (ISO 6946:2017, 6.9.4).`
				: `Rse = ${input.rse} m²·K/W as given.`)
	);
	const rse = input.rse === undefined ? rsi : given('Rse', input.rse, notes);
	return { rsi, rse, active: well };
}
