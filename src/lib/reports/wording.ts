/**
 * Figures and sentences that the element editor's result panel and the PDF reports both print, each
 * computed and worded once here so that the page and the document say the same thing: the heat flux
 * at the design temperatures, why a moisture check was not assessed (taken from the result, never from
 * the climate a snapshot carries), and the caution when the monthly Glaser method created moisture.
 * Pure functions of a stored element result; numbers written with `fx` (format.ts).
 */
import type { ElementResult } from '$lib/physics';
import { fx, monthName } from '$lib/format';

/* ------------------------------------------------------------------ heat flux */

export type HeatFluxWording = {
	/** q = U·(θi − θe), W/m² */
	q: number;
	/** "Heat flux q = U·(θi − θe)" */
	label: string;
	/** "5.19 W/m²" */
	value: string;
	/** what the figure is, with the design temperatures and the U-value it comes from */
	definition: string;
	/** label, value and definition in one sentence (the PDF's chart caption) */
	sentence: string;
};

/**
 * The element's heat flux at the design temperatures, q = U·(θi − θe) with U the unrounded U-value the
 * result reports (corrections included), W/m²: the mean heat flux through the whole element, the figure
 * consistent with its U (ISO 6946:2017 defines U as the heat flow rate per area and temperature
 * difference, clause 3, from memory). For a bridged element this is not the flux along the temperature
 * profile's path; see {@link clearFieldHeatFlux}.
 */
export function elementHeatFlux(r: Pick<ElementResult, 'uValue' | 'designTemperatures'>): HeatFluxWording {
	const { internal, external } = r.designTemperatures;
	const q = r.uValue * (internal - external);
	const label = 'Heat flux q = U·(θi − θe)';
	const value = `${fx(q, 2)} W/m²`;
	const definition = `the mean heat flux through the element at the design temperatures θi ${fx(internal, 1)} °C and θe ${fx(external, 1)} °C, from its unrounded U-value ${fx(r.uValue, 4)} W/(m²·K)`;
	return { q, label, value, definition, sentence: `${label} = ${value}: ${definition}.` };
}

/**
 * The flux along the path the temperature profile follows (through the main material of every bridged
 * layer: the clear field), W/m², labelled as such; null for an element without bridged layers, where it
 * is the element's own flux and needs no second line.
 */
export function clearFieldHeatFlux(
	r: Pick<ElementResult, 'heatFlux' | 'rUpper'>
): { q: number; label: string; value: string; definition: string; sentence: string } | null {
	if (r.rUpper === undefined) return null;
	const label = 'Clear-field heat flux';
	const value = `${fx(r.heatFlux, 2)} W/m²`;
	const definition =
		"along the temperature profile's path, through the main material of each bridged layer; not the element's mean";
	return { q: r.heatFlux, label, value, definition, sentence: `${label} ${value}: ${definition}.` };
}

/* ------------------------------------------------------------------ not assessed */

/** Why a moisture check has no result. */
export type NotAssessedReason = 'ground' | 'no-climate' | 'no-cold-month';

export type NotAssessed = {
	reason: NotAssessedReason;
	/** a table's or a result card's few words, e.g. "not assessed: floor on the ground" */
	short: string;
	/** the same as a line of its own on the page, e.g. "Not assessed for a floor in contact with the ground." */
	line: string;
	/** the full sentence of the report's section */
	sentence: string;
};

const CONDENSATION_NOT_ASSESSED: Record<'ground' | 'no-climate', NotAssessed> = {
	ground: {
		reason: 'ground',
		short: 'not assessed: floor on the ground',
		line: 'Not assessed for a floor in contact with the ground.',
		sentence:
			'Interstitial condensation is not assessed for a floor in contact with the ground: the Glaser method with the external climate does not describe the ground under the slab.'
	},
	'no-climate': {
		reason: 'no-climate',
		short: 'not assessed: no climate',
		line: 'Not assessed: no climate attached.',
		sentence: 'No climate is attached to this element: the interstitial condensation check was not run.'
	}
};

const SURFACE_NOT_ASSESSED: Record<'no-climate' | 'no-cold-month', NotAssessed> = {
	'no-climate': {
		reason: 'no-climate',
		short: 'not assessed: no climate',
		line: 'Not assessed: no climate attached.',
		sentence: 'No climate is attached to this element: the surface-humidity check was not run.'
	},
	'no-cold-month': {
		reason: 'no-cold-month',
		short: 'not assessed: no month colder outside',
		line: 'Not assessed: no month is colder outside than inside.',
		sentence: 'No month is colder outside than inside: the surface-humidity check does not apply.'
	}
};

/**
 * Why the interstitial-condensation check of a result did not run, or null when it ran. The engine runs
 * it for every element with a climate (which requires internal conditions) except a floor on the ground
 * (`ground` in the result; its note says "not assessed for a floor in contact with the ground"), so the
 * result alone tells the reason, whatever climate a snapshot carries beside it.
 */
export function condensationNotAssessed(
	r: Pick<ElementResult, 'condensation' | 'ground'>
): NotAssessed | null {
	if (r.condensation) return null;
	return CONDENSATION_NOT_ASSESSED[r.ground ? 'ground' : 'no-climate'];
}

/**
 * Why the surface-humidity (fRsi) check of a result did not run, or null when it ran: with a climate it
 * runs unless no month is colder outside than inside (the engine warns so); otherwise there was no
 * climate.
 */
export function surfaceNotAssessed(r: Pick<ElementResult, 'surface' | 'warnings'>): NotAssessed | null {
	if (r.surface) return null;
	const warm = r.warnings.some((w) => w.startsWith('No month is colder outside than inside'));
	return SURFACE_NOT_ASSESSED[warm ? 'no-cold-month' : 'no-climate'];
}

/* ------------------------------------------------------------------ mass balance */

type Outcome = 'none' | 'dries' | 'accumulates';

/** The part of a condensation result's `massBalance` this module reads (the field may be absent). */
type MassBalanceFigures = {
	created: number;
	conserving: {
		maxAccumulation: number;
		peakMonth: number | null;
		evaporatesFully: boolean;
		outcome: Outcome;
	};
};

/**
 * Share of the standard's peak accumulation above which the moisture its monthly method created is
 * shown (1 %; a threshold of this product, the same as the engine's warning; no standard sets one).
 */
export const CREATED_CAUTION_FRACTION = 0.01;

const OUTCOMES: readonly string[] = ['none', 'dries', 'accumulates'];
const isNumber = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

/** `massBalance` of a condensation result when it is there and well formed, else null. */
function massBalanceOf(c: object): MassBalanceFigures | null {
	const mb = (c as { massBalance?: unknown }).massBalance;
	if (typeof mb !== 'object' || mb === null) return null;
	const { created, conserving } = mb as { created?: unknown; conserving?: unknown };
	if (!isNumber(created) || typeof conserving !== 'object' || conserving === null) return null;
	const k = conserving as Record<string, unknown>;
	if (
		!isNumber(k.maxAccumulation) ||
		!(k.peakMonth === null || isNumber(k.peakMonth)) ||
		typeof k.evaporatesFully !== 'boolean' ||
		typeof k.outcome !== 'string' ||
		!OUTCOMES.includes(k.outcome)
	)
		return null;
	return {
		created,
		conserving: {
			maxAccumulation: k.maxAccumulation,
			peakMonth: k.peakMonth as number | null,
			evaporatesFully: k.evaporatesFully,
			outcome: k.outcome as Outcome
		}
	};
}

const OUTCOME_WORDS: Record<Outcome, string> = {
	none: 'no condensation',
	dries: 'dries out within the year',
	accumulates: 'condensate left at the end of the year'
};

/** One year's figures as the caution's table shows them. */
export type YearFigures = { peak: string; peakMonth: string; driesOut: string; outcome: string };

function yearFigures(y: {
	maxAccumulation: number;
	peakMonth: number | null;
	evaporatesFully: boolean;
	outcome: Outcome;
}): YearFigures {
	return {
		peak: `${fx(y.outcome === 'none' ? 0 : y.maxAccumulation, 1)} g/m²`,
		peakMonth: y.outcome === 'none' || y.peakMonth === null ? '—' : monthName(y.peakMonth),
		driesOut: y.outcome === 'none' ? 'not applicable' : y.evaporatesFully ? 'yes' : 'no',
		outcome: OUTCOME_WORDS[y.outcome]
	};
}

const yearWords = (y: YearFigures) =>
	y.peakMonth === '—' ? `peak ${y.peak}, ${y.outcome}` : `peak ${y.peak} in ${y.peakMonth}, ${y.outcome}`;

export type MassBalanceCaution = {
	/** g/m² the standard's months created over the year */
	created: number;
	heading: string;
	/** the caution in plain words, with both years' figures */
	text: string;
	/** row labels and the two columns: the standard's monthly method as reported, and kept in balance */
	rows: { label: string; standard: string; conserving: string }[];
	standardHeading: string;
	conservingHeading: string;
};

/**
 * The caution shown when the monthly Glaser method created moisture: a condensation result whose
 * `massBalance.created` (g/m² over the year) is above zero and above {@link CREATED_CAUTION_FRACTION} of
 * its peak accumulation. The standard's months hold an interface that dries out part-way through a
 * month at saturation until the month ends (ISO 13788:2012, clause 6, from memory), so vapour keeps
 * leaving a stock that is gone; the engine also runs the year split where an interface dries out, which
 * keeps the balance (`massBalance.conserving`). Null when the field is absent (results of engines
 * before it) or the amount is below the threshold. The standard's figures stay the reported ones.
 */
export function massBalanceCaution(
	c: Pick<
		NonNullable<ElementResult['condensation']>,
		'maxAccumulation' | 'peakMonth' | 'evaporatesFully' | 'outcome'
	>
): MassBalanceCaution | null {
	const mb = massBalanceOf(c);
	if (!mb) return null;
	const { created } = mb;
	if (!(created > 0 && created > CREATED_CAUTION_FRACTION * c.maxAccumulation)) return null;
	const standard = yearFigures(c);
	const conserving = yearFigures(mb.conserving);
	const same = yearWords(standard) === yearWords(conserving);
	const text =
		`The monthly method of the standard created ${fx(created, 1)} g/m² of moisture over the year that no vapour flow brought in: ` +
		'it keeps an interface that dries out part-way through a month wet until the month ends. ' +
		`Worked out with each such month split where the interface dries out, so that no moisture appears from nothing, the year gives ${yearWords(conserving)}; ` +
		`the standard's monthly method, as reported above, gives ${yearWords(standard)}.` +
		(same
			? ' Both give the same peak and outcome.'
			: " The reported figures are the standard's; judge the element with both in mind.");
	return {
		created,
		heading: 'Caution: the monthly method created moisture',
		text,
		standardHeading: 'Monthly method (ISO 13788:2012), as reported',
		conservingHeading: 'Kept in mass balance',
		rows: [
			{ label: 'Peak amount', standard: standard.peak, conserving: conserving.peak },
			{ label: 'Month of the peak', standard: standard.peakMonth, conserving: conserving.peakMonth },
			{ label: 'Dries out within the year', standard: standard.driesOut, conserving: conserving.driesOut },
			{ label: 'Outcome', standard: standard.outcome, conserving: conserving.outcome }
		]
	};
}
