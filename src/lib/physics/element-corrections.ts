/**
 * ΔU corrections of an element (ISO 6946:2017, Annex F) and the rule that omits them below 3 % of U
 * (clause 7), with the notes that explain what was found and done.
 */
import type { ElementInput } from './schema';
import type { LayerModel } from './element-model';
import { airGapCorrection, applyCorrections, fastenerCorrection } from './corrections';
import { fmt } from './note-format';

/** Corrections of one element, W/(m²·K). */
export interface ElementCorrections {
	deltaUAirGaps: number;
	deltaUFasteners: number;
	/** ΔU = ΔUg + ΔUf */
	deltaU: number;
	/** whether ΔU enters U */
	applied: boolean;
	/** U with ΔU applied or omitted */
	u: number;
}

/**
 * ΔU of the first `active` layers, W/(m²·K): air gaps ΔUg = ΔU″·(R1/RT)² (ISO 6946:2017, F.2) with
 * RT `rTotal`, fasteners ΔUf (F.3) with RT,h `rClear` (m²·K/W); applied to `uUncorrected` unless below
 * 3 % of it (clause 7) or always, as the input asks. Notes say what was calculated and whether it
 * is applied.
 */
export function elementCorrections(
	input: ElementInput,
	layers: readonly LayerModel[],
	active: number,
	rTotal: number,
	rClear: number,
	uUncorrected: number,
	notes: string[]
): ElementCorrections {
	let deltaUAirGaps = 0;
	let deltaUFasteners = 0;
	for (let i = 0; i < active; i++) {
		const m = layers[i];
		const level = m.layer.airGapLevel;
		if (level !== undefined && level > 0) deltaUAirGaps += airGapCorrection(level, m.r, rTotal);
		if (m.layer.fasteners) {
			const d0 = m.endMm - m.startMm;
			const f = m.layer.fasteners;
			deltaUFasteners += fastenerCorrection(f, d0, m.r, rClear);
			if (f.lambda < 1)
				notes.push(`Layer ${i + 1}: fasteners of λ < 1 W/(m·K) need no correction (ISO 6946:2017, F.3).`);
		}
	}
	const deltaU = deltaUAirGaps + deltaUFasteners;
	const applied = applyCorrections(uUncorrected, deltaU, input.corrections ?? 'standard');
	const result = { deltaUAirGaps, deltaUFasteners, deltaU, applied: applied.applied, u: applied.u };
	correctionNotes(input, active, result, uUncorrected, notes);
	return result;
}

/** The notes on ΔU: which corrections were entered, their sizes (W/(m²·K)) and the 3 % rule. */
function correctionNotes(
	input: ElementInput,
	active: number,
	{ deltaUAirGaps, deltaUFasteners, deltaU, applied }: ElementCorrections,
	uUncorrected: number,
	notes: string[]
): void {
	const gapsGiven = input.layers.some((l, i) => i < active && l.airGapLevel !== undefined);
	const fastenersGiven = input.layers.some((l, i) => i < active && l.fasteners !== undefined);
	const parts: string[] = [];
	if (gapsGiven) parts.push(`air gaps ${fmt(deltaUAirGaps, 4)}`);
	if (fastenersGiven) parts.push(`fasteners ${fmt(deltaUFasteners, 4)}`);
	if (!gapsGiven && !fastenersGiven) {
		notes.push('Corrections ΔU: no air-gap level and no fasteners entered, so none is calculated.');
	} else if (deltaU === 0) {
		notes.push(
			`Corrections ΔU: ${parts.join(', ')} W/(m²·K) — nothing to add` +
				(!gapsGiven ? '; air-gap level not given.' : !fastenersGiven ? '; no fasteners entered.' : '.')
		);
	}
	if (deltaU > 0) {
		notes.push(
			applied
				? `ΔU = ${fmt(deltaU, 4)} W/(m²·K) (${parts.join(', ')}; ISO 6946:2017 Annex F) is applied` +
						(input.corrections === 'always'
							? ' as asked.'
							: `: it is ${fmt((deltaU / uUncorrected) * 100, 1)} % of U, not below 3 %.`)
				: `ΔU = ${fmt(deltaU, 4)} W/(m²·K) (${parts.join(', ')}) is ${fmt((deltaU / uUncorrected) * 100, 1)} % of U, below 3 %, and is omitted (ISO 6946:2017, clause 7).`
		);
		if (!gapsGiven) notes.push('Air-gap level not given: no air-gap correction.');
		if (!fastenersGiven) notes.push('No fasteners entered: no fastener correction.');
	}
}
