/**
 * Interstitial condensation of an element by the monthly Glaser method (ISO 13788:2012, clause 6)
 * on the nodes of its heat chain, and the acceptance of the outcome by the chosen limits.
 */
import type { CondensationResult, MoistureLimits } from './schema';
import type { HeatChain } from './element-heat-chain';
import { runGlaserWithBalance, type GlaserMassBalance, type GlaserMonth, type GlaserResult } from './glaser';
import { fmt } from './note-format';

/**
 * The Glaser cycle (ISO 13788:2012, clause 6) over the vapour nodes from the internal to the
 * external surface: the chain's sublayers with their sd (m) and dimensionless temperatures φ, the
 * twelve `months` in calendar order. Amounts g/m², pressures Pa. Accepted when `limits` are met.
 * Warns of surface condensation (outside the method, Rsi `rsi` m²·K/W); notes the start month.
 * Adds the mass balance of the months (glaser-conserving.ts) and warns when they created more
 * than {@link CREATED_WARNING_FRACTION} of the peak accumulation.
 */
export function condensationCheck(
	chain: HeatChain,
	phi: readonly number[],
	months: readonly GlaserMonth[],
	limits: MoistureLimits,
	rsi: number,
	notes: string[],
	warnings: string[]
): CondensationResult {
	const nElem = chain.elements;
	const { glaser, massBalance } = runGlaserWithBalance(
		{
			elements: nElem - 2,
			positionMm: chain.positionMm.slice(1, nElem),
			sd: chain.sd.slice(1, nElem - 1),
			phi: phi.slice(1, nElem),
			layerIndex: chain.layerIndex.slice(1, nElem),
			kind: chain.kind.slice(1, nElem)
		},
		months
	);
	const reasons = acceptanceReasons(glaser, limits);
	if (glaser.surfaceCondensationMonths.length) {
		warnings.push(
			`The internal vapour pressure exceeds saturation at the internal surface (Rsi ${rsi}) in month(s) ${glaser.surfaceCondensationMonths.join(', ')}: surface condensation, outside the Glaser method.`
		);
	}
	if (glaser.condensesEveryMonth) {
		notes.push(
			'Condensation is predicted in every month; the Glaser cycle starts in the first month of the climate.'
		);
	} else if (glaser.startMonth !== null) {
		notes.push(
			`The Glaser cycle starts in month ${glaser.startMonth}, the first month with condensation after one without (ISO 13788:2012, clause 6).`
		);
	}
	const created = createdWarning(glaser, massBalance);
	if (created) warnings.push(created);
	return {
		months: glaser.months,
		maxAccumulation: glaser.maxAccumulation,
		peakMonth: glaser.peakMonth,
		maxAtInterface: glaser.maxAtInterface,
		maxAtInterfaceNode: glaser.maxAtInterfaceNode,
		evaporatesFully: glaser.evaporatesFully,
		condensationMonths: glaser.condensationMonths,
		outcome: glaser.outcome,
		startMonth: glaser.startMonth,
		condensesEveryMonth: glaser.condensesEveryMonth,
		surfaceCondensationMonths: glaser.surfaceCondensationMonths,
		nodes: glaser.nodes,
		vapourProfile: glaser.vapourProfile,
		acceptance: { pass: reasons.length === 0, reasons },
		massBalance
	};
}

/**
 * Share of the peak accumulation above which the moisture the monthly method created is warned
 * of (1 %; a threshold of this product, no standard sets one).
 */
export const CREATED_WARNING_FRACTION = 0.01;

const OUTCOME_WORDS: Record<GlaserResult['outcome'], string> = {
	none: 'no condensation',
	dries: 'dries out within the year',
	accumulates: 'condensate left at the end of the year'
};

/** "peak … g/m² in month …, <outcome>" of a cycle's figures (amounts g/m²). */
function yearWords(r: {
	maxAccumulation: number;
	peakMonth: number | null;
	outcome: GlaserResult['outcome'];
}): string {
	const peak =
		r.peakMonth === null
			? 'nothing held at the end of any month'
			: `peak ${fmt(r.maxAccumulation, 1)} g/m² in month ${r.peakMonth}`;
	return `${peak}, ${OUTCOME_WORDS[r.outcome]}`;
}

/**
 * The warning that the monthly method created moisture (`massBalance.created`, g/m², above
 * {@link CREATED_WARNING_FRACTION} of the peak accumulation), with the figures of the cycle that
 * keeps the mass balance beside the standard's, and a word when both read the same (the moisture
 * created left through the surfaces within the month); null when there is nothing to warn of.
 */
export function createdWarning(glaser: GlaserResult, massBalance: GlaserMassBalance): string | null {
	const { created, conserving } = massBalance;
	if (!(created > 0 && created > CREATED_WARNING_FRACTION * glaser.maxAccumulation)) return null;
	const conservingWords = yearWords(conserving);
	const standardWords = yearWords(glaser);
	return (
		`The monthly Glaser method created ${fmt(created, 1)} g/m² of moisture this year that no vapour flow brought in: ` +
		'an interface that dries out part-way through a month is still held at saturation until the month ends (ISO 13788:2012, clause 6). ' +
		`Split where an interface dries out, the same year keeps its moisture balance: ${conservingWords}. ` +
		`The monthly method as reported: ${standardWords}.` +
		(conservingWords === standardWords ? ' Both give the same peak and outcome.' : '')
	);
}

/**
 * Why a Glaser outcome is not acceptable (empty when it is): condensate left at the end of the
 * year (unless evaporation is not required), or more than the limit at one interface or in total, g/m².
 */
export function acceptanceReasons(glaser: GlaserResult, limits: MoistureLimits): string[] {
	const reasons: string[] = [];
	if ((limits.requireEvaporation ?? true) && !glaser.evaporatesFully)
		reasons.push('condensate does not evaporate fully within the year');
	if (limits.maxAtInterfaceGm2 !== undefined && glaser.maxAtInterface > limits.maxAtInterfaceGm2) {
		reasons.push(
			`${fmt(glaser.maxAtInterface, 1)} g/m² at one interface exceeds the limit of ${limits.maxAtInterfaceGm2} g/m²`
		);
	}
	if (limits.maxTotalGm2 !== undefined && glaser.maxAccumulation > limits.maxTotalGm2) {
		reasons.push(
			`${fmt(glaser.maxAccumulation, 1)} g/m² in total exceeds the limit of ${limits.maxTotalGm2} g/m²`
		);
	}
	return reasons;
}
