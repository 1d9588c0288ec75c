/**
 * Total thermal resistance of the layers that count: the combined method for bridged layers
 * (ISO 6946:2017, 6.7.2) and the weighting for a slightly ventilated air layer (6.9.3).
 */
import type { ElementInput } from './schema';
import { R_NEGLIGIBLE } from './bounds';
import { SLIGHTLY_VENTILATED_OUTER_CAP, slightlyVentilatedTotal } from './resistances';
import {
	COMBINED_METHOD_MAX_RATIO,
	combinedMethod,
	type CombinedResult,
	type SeriesLayerR
} from './bridging';
import type { LayerModel } from './element-model';
import { fmt } from './note-format';

/** Totals of an element from environment to environment, m²·K/W. */
export interface ResistanceTotals {
	/** the combined method over the layers as they are (its sections and equivalent resistances) */
	combined: CombinedResult;
	/** RT, R′T and R″T (weighted for a slightly ventilated air layer) */
	rTotal: number;
	rUpper: number;
	rLower: number;
	/** RT through the main material of every layer (weighted likewise), the RT,h of Annex F */
	rClear: number;
}

/** Layers `from … to − 1` as the combined method takes them, every resistance × `scale`. */
function seriesOf(layers: readonly LayerModel[], from: number, to: number, scale = 1): SeriesLayerR[] {
	const out: SeriesLayerR[] = [];
	for (let i = from; i < to; i++) {
		const m = layers[i];
		out.push(
			m.fraction !== undefined
				? { r: m.r * scale, rBridge: (m.rBridge as number) * scale, fraction: m.fraction }
				: { r: m.r * scale }
		);
	}
	return out;
}

/**
 * RT, R′T, R″T and the clear-field total, m²·K/W, of the first `active` layers between Rsi and the
 * resistance outside them `rOut` (Rse plus a roof space): the combined method of ISO 6946:2017,
 * 6.7.2, or with a slightly ventilated air layer the weighting of 6.9.3. Sets each layer's
 * equivalent resistance (and the path resistance of a slightly ventilated air layer).
 */
export function totalResistance(
	input: ElementInput,
	layers: LayerModel[],
	active: number,
	rsi: number,
	rOut: number,
	notes: string[],
	warnings: string[]
): ResistanceTotals {
	const slightly = layers.findIndex((m, i) => i < active && m.kind === 'air-slightly-ventilated');
	if (slightly >= 0)
		return slightlyVentilatedTotals(input, layers, active, slightly, rsi, rOut, notes, warnings);
	const combined = combinedMethod(rsi, rOut, seriesOf(layers, 0, active));
	for (let i = 0; i < active; i++) layers[i].rEquivalent = combined.rEquivalent[i];
	const { rTotal, rUpper, rLower, rClear } = combined;
	return { combined, rTotal, rUpper, rLower, rClear };
}

/**
 * Totals with layer `slightly` a slightly ventilated air layer (ISO 6946:2017, 6.9.3), m²·K/W:
 * RT = (1500 − Av)/1000·RT,u + (Av − 500)/1000·RT,v, with the resistance outside the air layer
 * limited to 0.15 m²·K/W in RT,u and RT,v that of the well-ventilated case (6.9.4); R′T, R″T and
 * the clear-field total weighted alike. Along the profile path the air layer carries what makes the
 * series total equal the weighted clear-field RT (not below 0).
 */
function slightlyVentilatedTotals(
	input: ElementInput,
	layers: LayerModel[],
	active: number,
	slightly: number,
	rsi: number,
	rOut: number,
	notes: string[],
	warnings: string[]
): ResistanceTotals {
	const av = layers[slightly].layer.openingAreaMm2 as number;
	const outer = combinedMethod(0, 0, seriesOf(layers, slightly + 1, active)).rLower;
	const scale = outer > SLIGHTLY_VENTILATED_OUTER_CAP ? SLIGHTLY_VENTILATED_OUTER_CAP / outer : 1;
	const unvent = combinedMethod(rsi, rOut, [
		...seriesOf(layers, 0, slightly + 1),
		...seriesOf(layers, slightly + 1, active, scale)
	]);
	const vent = combinedMethod(rsi, input.rse ?? rsi, seriesOf(layers, 0, slightly));
	const rTotal = slightlyVentilatedTotal(av, unvent.rTotal, vent.rTotal);
	const rUpper = slightlyVentilatedTotal(av, unvent.rUpper, vent.rUpper);
	const rLower = slightlyVentilatedTotal(av, unvent.rLower, vent.rLower);
	const rClear = slightlyVentilatedTotal(av, unvent.rClear, vent.rClear);
	notes.push(
		`Layer ${slightly + 1} is slightly ventilated (${av} mm²): RT = (1500 − Av)/1000·RT,u + (Av − 500)/1000·RT,v (ISO 6946:2017, 6.9.3)` +
			(scale < 1
				? `, with the ${fmt(outer)} m²·K/W outside it limited to ${SLIGHTLY_VENTILATED_OUTER_CAP} m²·K/W in RT,u.`
				: '.')
	);
	let others = rsi + rOut;
	for (let i = 0; i < active; i++) if (i !== slightly) others += layers[i].r;
	const eff = rClear - others;
	// not below 0, and a negligible remainder (round-off) is zero: see R_NEGLIGIBLE
	layers[slightly].rPath = eff < R_NEGLIGIBLE ? 0 : eff;
	warnings.push(
		`Layer ${slightly + 1} (${layers[slightly].layer.name}): the temperature profile through a slightly ventilated air layer is approximate` +
			(eff < 0 ? ' and does not reproduce RT exactly.' : '.')
	);
	// Sections and equivalent resistances of the layers as they are (unscaled).
	const combined = combinedMethod(rsi, rOut, seriesOf(layers, 0, active));
	for (let i = 0; i < active; i++) layers[i].rEquivalent = combined.rEquivalent[i];
	layers[slightly].rEquivalent = layers[slightly].rPath;
	return { combined, rTotal, rUpper, rLower, rClear };
}

/**
 * Notes on the combined method (ISO 6946:2017, 6.7.2): R′T, R″T, RT (m²·K/W) and the relative
 * error e; a warning when R′T/R″T exceeds 1.5 (e > 20 %), outside the method's range.
 */
export function bridgingNotes(
	rUpper: number,
	rLower: number,
	rTotal: number,
	relativeError: number,
	notes: string[],
	warnings: string[]
): void {
	notes.push(
		`Bridged layers by the combined method (ISO 6946:2017, 6.7.2): R'T = ${fmt(rUpper)}, R''T = ${fmt(rLower)}, RT = ${fmt(rTotal)} m²·K/W, maximum relative error ${fmt(relativeError * 100, 1)} %.`
	);
	notes.push(
		'Temperatures and moisture checks follow the section through the main material of each bridged layer (the colder path for the outer layers); the U-value uses the combined method.'
	);
	if (rUpper / rLower > COMBINED_METHOD_MAX_RATIO) {
		warnings.push(
			`The upper limit exceeds the lower limit by more than ${COMBINED_METHOD_MAX_RATIO}× (relative error ${fmt(relativeError * 100, 1)} % > 20 %): the combined method is outside its range; use a numerical calculation (ISO 10211).`
		);
	}
}
