/**
 * The summary for the client, in plain words: what was assessed, whether each element meets its limit,
 * any risk of damp or mould, what to do next, and the cautions. One pure function of a report snapshot
 * (or the pieces of it read here), so that the PDF's first pages, the e-mail (HTML and plain text) and
 * the reports page say the same thing. The verdicts come from the rules that the technical pages use:
 * `summariseElements` (dwellings/summary.ts, through `meetsLimit`) for the limits and what counts as a
 * moisture risk, and the wording helpers (reports/wording.ts) for why a check did not run.
 */
import type { ElementResult } from '$lib/physics';
import type { ElementKind } from '$lib/dwellings/kinds';
import { summariseElements, type ElementBrief } from '$lib/dwellings/summary';
import { condensationNotAssessed, massBalanceCaution, surfaceNotAssessed } from '$lib/reports/wording';
import { fx, groupCode, longDate, monthName } from '$lib/format';

/* ------------------------------------------------------------------ input */

/** What the summary reads of an element (a report snapshot's element fits). */
export type ClientSummaryElement = {
	name: string;
	kind: ElementKind;
	area: number;
	heatFlow: ElementBrief['heatFlow'];
	givenU?: number | null;
	/** the U-value compared with the limit (the rounded result, or the given value), W/(m²·K) */
	u: number | null;
	/** the limit for its kind, W/(m²·K), or null when the limit table sets none */
	limit: number | null;
	result: Pick<ElementResult, 'uValue' | 'condensation' | 'surface' | 'ground' | 'warnings'> | null;
};

/** What the summary reads of a junction (a snapshot's junction fits). */
export type ClientSummaryJunction = {
	name: string;
	result: { surface: { critical: { pass: boolean } | null } } | null;
};

/** What the summary reads of a report (a `ReportSnapshot` fits). */
export type ClientSummaryInput = {
	dwelling: { reference: string; address: string; clientName: string | null };
	organisation: { name: string };
	limitTable: { name: string; edition: string } | null;
	elements: ClientSummaryElement[];
	junctions?: ClientSummaryJunction[];
	issuedAt: string;
	document: {
		scope: 'element' | 'dwelling';
		draft: boolean;
		number: string;
		revision: number;
		verificationCode: string | null;
		verifyUrl: string | null;
	};
};

/* ------------------------------------------------------------------ output */

/** How a finding reads: good, worth knowing, a problem, or neutral. Shown with a word, never colour alone. */
export type Tone = 'pass' | 'caution' | 'fail' | 'none';

export type Finding = {
	text: string;
	tone: Tone;
	/** a few words that name what the paragraph is about, set before it */
	label?: string;
};

/** The word that leads a finding of each tone, so that no verdict rests on colour alone. */
export const TONE_WORDS: Record<Tone, string> = {
	pass: 'Good',
	caution: 'Worth knowing',
	fail: 'Needs attention',
	none: ''
};

export type ClientSummaryRow = {
	name: string;
	/** the kind in plain words, e.g. "outside wall" */
	kind: string;
	/** "0.28" (W/(m²·K), the table's unit) or "—" */
	u: string;
	/** "0.30" or "none set" */
	limit: string;
	/** meets, does not meet, no limit, or not worked out */
	verdict: Finding;
	/** damp and mould in a few words */
	moisture: Finding;
};

export type ClientSummary = {
	/** the small line above the title */
	kicker: string;
	title: string;
	/** the whole finding in one sentence */
	headline: Finding;
	/** "Prepared for Sam Client", when the client's name is recorded */
	preparedFor: string | null;
	/** who, what and which report */
	intro: string[];
	assessed: { heading: string; paragraphs: string[] };
	heatLoss: { heading: string; paragraphs: Finding[] };
	table: {
		columns: {
			name: string;
			kind: string;
			u: string;
			limit: string;
			/** the unit of the figure and the limit */
			unit: string;
			verdict: string;
			moisture: string;
		};
		rows: ClientSummaryRow[];
	};
	moisture: { heading: string; paragraphs: Finding[] };
	nextSteps: { heading: string; items: Finding[] };
	cautions: { heading: string; items: readonly string[] };
	/** where the technical pages take over */
	closing: string;
};

/* ------------------------------------------------------------------ words */

/** Each kind of element in plain words, one and several. */
const KIND_WORDS: Record<ElementKind, [string, string]> = {
	'external-wall': ['outside wall', 'outside walls'],
	'party-wall': ['wall shared with a neighbour', 'walls shared with a neighbour'],
	'pitched-roof-ceiling': ['sloping roof insulated at the ceiling', 'sloping roofs insulated at the ceiling'],
	'pitched-roof-rafters': [
		'sloping roof insulated along its slope',
		'sloping roofs insulated along their slope'
	],
	'flat-roof': ['flat roof', 'flat roofs'],
	'ground-floor': ['floor on the ground', 'floors on the ground'],
	'exposed-floor': ['floor above outside air', 'floors above outside air'],
	window: ['window', 'windows'],
	door: ['door', 'doors']
};

const NUMBER_WORDS = ['no', 'one', 'two', 'three', 'four', 'five', 'six', 'seven', 'eight', 'nine', 'ten'];
/** "one", "two" … "ten", then figures. */
const count = (n: number) => NUMBER_WORDS[n] ?? String(n);
/** "one outside wall", "3 windows" */
const countOf = (n: number, one: string, many: string) => `${count(n)} ${n === 1 ? one : many}`;
const capital = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);
/** "an outside wall", "a window" */
const withArticle = (s: string) => `${/^[aeiou]/.test(s) ? 'an' : 'a'} ${s}`;

/** Names in a sentence: "A", "A and B", "A, B and C", each in quotation marks. */
function names(list: string[]): string {
	const q = list.map((n) => `“${n}”`);
	return q.length > 1 ? `${q.slice(0, -1).join(', ')} and ${q[q.length - 1]}` : (q[0] ?? '');
}

const U_UNIT = 'W/(m²·K)';

/** The worst of several tones: fail, then caution, then pass; neutral only when nothing else. */
function worst(tones: Tone[]): Tone {
	for (const t of ['fail', 'caution', 'pass'] as const) if (tones.includes(t)) return t;
	return 'none';
}

/* ------------------------------------------------------------------ per element */

type Judged = {
	el: ClientSummaryElement;
	/** from the limit rule: null when there is no limit or no U */
	pass: boolean | null;
	/** condensation within the layers: the Glaser outcome, or why it did not run */
	glaser: 'none' | 'dries' | 'accumulates' | 'ground' | 'no-climate' | 'given' | 'missing';
	/** mould at the inside surface: the fRsi verdict, or why it did not run */
	mould: 'pass' | 'fail' | 'no-climate' | 'no-cold-month' | 'given' | 'missing';
	/** the monthly method created moisture (the technical pages explain it) */
	massBalanceNote: boolean;
};

function judge(elements: ClientSummaryElement[]): {
	judged: Judged[];
	failing: number;
	moistureRisk: number;
} {
	// The limit verdicts and the count of moisture risks by the fabric summary's own rule.
	const briefs: ElementBrief[] = elements.map((e, i) => ({
		id: String(i),
		position: i,
		name: e.name,
		kind: e.kind,
		area: e.area,
		heatFlow: e.heatFlow,
		uValue: e.result ? e.result.uValue : (e.givenU ?? null),
		uValueRounded: e.u,
		given: !e.result && e.givenU != null,
		moisture: e.result?.condensation?.outcome ?? null,
		surfacePass: e.result?.surface ? e.result.surface.pass : null,
		engineVersion: null,
		version: 0,
		updatedAt: ''
	}));
	const limits: Partial<Record<ElementKind, number>> = {};
	for (const e of elements) if (e.limit !== null) limits[e.kind] = e.limit;
	const { rows, totals } = summariseElements(briefs, limits);
	const judged = elements.map((el, i): Judged => {
		const r = el.result;
		const given = !r && el.givenU != null;
		let glaser: Judged['glaser'] = given ? 'given' : 'missing';
		let mould: Judged['mould'] = given ? 'given' : 'missing';
		let massBalanceNote = false;
		if (r) {
			const c = r.condensation;
			glaser = c ? c.outcome : condensationNotAssessed(r)!.reason === 'ground' ? 'ground' : 'no-climate';
			mould = r.surface
				? r.surface.pass
					? 'pass'
					: 'fail'
				: (surfaceNotAssessed(r)!.reason as 'no-climate' | 'no-cold-month');
			massBalanceNote = c ? massBalanceCaution(c) !== null : false;
		}
		return { el, pass: rows[i].pass, glaser, mould, massBalanceNote };
	});
	return { judged, failing: totals.failing, moistureRisk: totals.moistureRisk };
}

function verdictOf(j: Judged): Finding {
	if (j.el.u === null) return { text: 'not worked out', tone: 'none' };
	if (j.pass === null) return { text: 'no limit set', tone: 'none' };
	return j.pass
		? { text: 'meets its limit', tone: 'pass' }
		: { text: 'does not meet its limit', tone: 'fail' };
}

function moistureOf(j: Judged): Finding {
	if (j.glaser === 'given') return { text: 'not checked (U-value given, not calculated)', tone: 'none' };
	if (j.glaser === 'missing') return { text: 'not checked', tone: 'none' };
	const parts: Finding[] = [];
	if (j.mould === 'fail') parts.push({ text: 'risk of mould on the inside surface', tone: 'fail' });
	if (j.glaser === 'accumulates')
		parts.push({ text: 'water builds up inside it year after year', tone: 'fail' });
	if (j.glaser === 'dries')
		parts.push({ text: 'some condensation inside in winter, which dries out', tone: 'caution' });
	if (j.glaser === 'ground') {
		if (j.mould === 'pass') parts.push({ text: 'no mould risk found', tone: 'pass' });
		if (j.mould === 'no-climate') parts.push({ text: 'mould not checked (no climate data)', tone: 'none' });
		parts.push({ text: 'condensation inside not checked (floor on the ground)', tone: 'none' });
	} else if (!parts.length && (j.mould === 'pass' || j.glaser === 'none'))
		parts.push({ text: 'no risk found', tone: 'pass' });
	if (j.glaser === 'no-climate' && j.mould === 'no-climate')
		return { text: 'not checked (no climate data)', tone: 'none' };
	if (j.mould === 'no-cold-month')
		parts.push({ text: 'surface check not needed (never colder outside)', tone: 'none' });
	if (!parts.length) return { text: 'not checked', tone: 'none' };
	return { text: capital(parts.map((p) => p.text).join('; ')), tone: worst(parts.map((p) => p.tone)) };
}

/* ------------------------------------------------------------------ the summary */

/** The elements sorted by what the summary says of them, and the junctions that were modelled. */
function groupsOf(s: ClientSummaryInput, judged: Judged[]) {
	const mould = judged.filter((j) => j.mould === 'fail');
	const junctions = (s.junctions ?? []).filter((j) => j.result?.surface.critical);
	const coldJunctions = junctions.filter((j) => !j.result!.surface.critical!.pass);
	return {
		judged,
		lt: s.limitTable,
		withLimit: judged.filter((j) => j.pass !== null),
		failed: judged.filter((j) => j.pass === false),
		noLimit: judged.filter((j) => j.pass === null && j.el.u !== null),
		noU: judged.filter((j) => j.el.u === null),
		checkedMould: judged.filter((j) => j.mould === 'pass' || j.mould === 'fail'),
		mould,
		checkedGlaser: judged.filter((j) => ['none', 'dries', 'accumulates'].includes(j.glaser)),
		builds: judged.filter((j) => j.glaser === 'accumulates'),
		dries: judged.filter((j) => j.glaser === 'dries'),
		onGround: judged.filter((j) => j.glaser === 'ground'),
		noClimate: judged.filter((j) => j.glaser === 'no-climate' && j.mould === 'no-climate'),
		givenOnly: judged.filter((j) => j.glaser === 'given'),
		junctions,
		coldJunctions,
		/** where the inside surface may grow mould: elements, then junctions */
		mouldAt: [...mould.map((j) => j.el.name), ...coldJunctions.map((j) => j.name)]
	};
}
type Groups = ReturnType<typeof groupsOf>;

/** "What was assessed": how many elements of which kinds, and how their figures were found. */
function assessedParagraphs(s: ClientSummaryInput, judged: Judged[]): string[] {
	const doc = s.document;
	const n = judged.length;
	const byKind = new Map<ElementKind, number>();
	for (const j of judged) byKind.set(j.el.kind, (byKind.get(j.el.kind) ?? 0) + 1);
	const kinds = [...byKind].map(([k, m]) => countOf(m, ...KIND_WORDS[k]));
	const kindList =
		kinds.length > 1 ? `${kinds.slice(0, -1).join(', ')} and ${kinds[kinds.length - 1]}` : kinds[0];
	const assessed: string[] = [];
	if (doc.scope === 'element' && n === 1) {
		assessed.push(
			`This report looks at one part of the home’s outer shell (an element): ${names([judged[0].el.name])}, ${withArticle(KIND_WORDS[judged[0].el.kind][0])}.`
		);
	} else {
		assessed.push(
			`This report looks at ${countOf(n, 'part', 'parts')} of the home’s outer shell, each called an element: ${kindList ?? 'none'}.`
		);
	}
	assessed.push(
		'For each wall, roof and floor the layers it is built of were entered one by one, from the inside to the outside, and its heat loss and moisture were worked out from them. Windows and doors use the figure given for them by their maker or another source named in the report.'
	);
	if (!judged.some((j) => j.el.result))
		assessed[1] =
			'Every element uses a figure given for it by its maker or another source named in the report.';
	return assessed;
}

/** "Heat loss": what a U-value is, the limit table, and each element against its limit. */
function heatLossFindings(g: Groups): Finding[] {
	const { lt, withLimit, failed, noLimit, noU } = g;
	const heat: Finding[] = [
		{
			text: `Each element has a heat loss figure (U-value): how many watts of heat pass through one square metre of it for every degree of difference between inside and outside, in ${U_UNIT}. The lower the figure, the better the element keeps the heat in.`,
			tone: 'none'
		}
	];
	if (lt) {
		heat.push({
			text: `The limits come from “${lt.name}” (${lt.edition}): the highest heat loss figure each kind of element may have. An element meets its limit when its figure is at or below it.`,
			tone: 'none'
		});
	}
	if (failed.length) {
		const each = failed.map(
			(j) => `${names([j.el.name])} has ${fx(j.el.u, 2)} against a limit of ${fx(j.el.limit, 2)}`
		);
		heat.push({
			text: `${capital(countOf(failed.length, 'element does', 'elements do'))} not meet ${failed.length === 1 ? 'its limit' : 'their limits'}: ${each.join('; ')} ${U_UNIT}. ${failed.length === 1 ? 'It lets' : 'They let'} more heat out than the limit allows.`,
			tone: 'fail'
		});
		const met = withLimit.length - failed.length;
		if (met > 0)
			heat.push({
				text:
					met === 1
						? 'The other element with a limit meets it.'
						: `The other ${countOf(met, 'element', 'elements')} with a limit meet theirs.`,
				tone: 'pass'
			});
	} else if (withLimit.length) {
		heat.push({
			text:
				withLimit.length === 1
					? `${names([withLimit[0].el.name])} meets its limit.`
					: 'Every element with a limit meets it.',
			tone: 'pass'
		});
	}
	if (noLimit.length) {
		heat.push({
			text: lt
				? `No limit is set for ${names(noLimit.map((j) => j.el.name))} in the limit table used, so ${noLimit.length === 1 ? 'its figure is' : 'their figures are'} given without a verdict.`
				: `No limit table applies to this home, so the figures are given without a verdict.`,
			tone: 'none'
		});
	}
	if (noU.length)
		heat.push({
			text: `No heat loss figure could be worked out yet for ${names(noU.map((j) => j.el.name))}.`,
			tone: 'none'
		});
	return heat;
}

/** "Damp and mould": the surface check, the Glaser check, what was not checked, and the junctions. */
function moistureFindings(g: Groups): Finding[] {
	const { judged, checkedMould, mould, checkedGlaser, builds, dries, onGround, noClimate, givenOnly } = g;
	const { junctions, coldJunctions } = g;
	const n = judged.length;
	const moisture: Finding[] = [];
	if (checkedMould.length) {
		moisture.push({
			label: 'Mould on inside surfaces',
			text: 'It was checked whether the inside face of each element stays warm enough, in the coldest conditions of the year, for mould to be unlikely to grow (the surface temperature factor, fRsi).',
			tone: 'none'
		});
		moisture.push(
			mould.length
				? {
						text: `The inside surface of ${names(mould.map((j) => j.el.name))} may get cold and damp enough for mould to grow, most of all in ${monthsOf(mould)}.`,
						tone: 'fail'
					}
				: {
						text: `No inside surface of the ${checkedMould.length === 1 ? 'element' : 'elements'} checked is expected to get cold enough for mould to grow, under the conditions assumed.`,
						tone: 'pass'
					}
		);
	}
	if (checkedGlaser.length) {
		moisture.push({
			label: 'Condensation inside the construction',
			text: 'It was checked whether moisture from the air indoors could turn to water within the layers over a typical year, month by month (the Glaser method).',
			tone: 'none'
		});
		if (builds.length)
			moisture.push({
				text: `In ${names(builds.map((j) => j.el.name))} water forms inside the construction in the colder months and does not dry out by the end of the year, so it would build up year after year. Over time this can cause damp, rot or corrosion and make the insulation work less well.`,
				tone: 'fail'
			});
		if (dries.length)
			moisture.push({
				text: `In ${names(dries.map((j) => j.el.name))} a little water forms inside the construction in the colder months but dries out again within the year. This is usually acceptable, provided the layers are built as described.`,
				tone: 'caution'
			});
		if (!builds.length && !dries.length)
			moisture.push({
				text: `No water is expected to form inside the ${checkedGlaser.length === 1 ? 'element' : 'elements'} checked in any month.`,
				tone: 'pass'
			});
		const noted = judged.filter((j) => j.massBalanceNote);
		if (noted.length)
			moisture.push({
				text: `For ${names(noted.map((j) => j.el.name))} the technical pages add a note on how the amount of water was worked out; your assessor can explain what it means.`,
				tone: 'caution'
			});
	}
	if (onGround.length)
		moisture.push({
			text: `Condensation inside ${names(onGround.map((j) => j.el.name))} was not checked: the method does not apply to a floor lying on the ground.`,
			tone: 'none'
		});
	if (noClimate.length)
		moisture.push({
			text: `${names(noClimate.map((j) => j.el.name))} ${noClimate.length === 1 ? 'was' : 'were'} not checked for damp or mould, because no climate data (the outside temperatures and humidity through the year) was attached.`,
			tone: 'none'
		});
	if (givenOnly.length)
		moisture.push({
			text: `${capital(givenOnly.length === n ? 'the elements' : names(givenOnly.map((j) => j.el.name)))} ${givenOnly.length === 1 ? 'uses' : 'use'} a given figure and ${givenOnly.length === 1 ? 'is' : 'are'} not checked for damp or mould here.`,
			tone: 'none'
		});
	if (coldJunctions.length)
		moisture.push({
			text: `Where elements meet, at ${names(coldJunctions.map((j) => j.name))}, the inside surface may get cold enough for mould to grow.`,
			tone: 'fail'
		});
	else if (junctions.length)
		moisture.push({
			text: `The places where elements meet that were modelled (junctions such as corners and floor edges) pass the same mould check.`,
			tone: 'pass'
		});
	return moisture;
}

/** "What to do next": one step per problem found, then what holds for every report. */
function nextSteps(g: Groups, doc: ClientSummaryInput['document']): Finding[] {
	const { lt, failed, noLimit, builds, dries, noClimate, mouldAt } = g;
	const next: Finding[] = [];
	if (failed.length)
		next.push({
			text: `Ask your assessor or designer how ${names(failed.map((j) => j.el.name))} could be brought within ${failed.length === 1 ? 'its limit' : 'the limits'}, for example with more or better insulation, and have the changed design assessed again.`,
			tone: 'fail'
		});
	if (builds.length)
		next.push({
			text: `Do not build ${names(builds.map((j) => j.el.name))} as described without advice. Ask your assessor or designer to change the build-up (for example, where a layer that holds back moisture from indoors, a vapour control layer, sits) and to check it again.`,
			tone: 'fail'
		});
	if (mouldAt.length)
		next.push({
			text: `Ask your assessor how the inside surface of ${names(mouldAt)} can be kept warmer, usually with more insulation. Until then, heating and ventilating the rooms well lowers the risk of mould.`,
			tone: 'fail'
		});
	if (dries.length && !builds.length)
		next.push({
			text: `No change is needed for the condensation that dries out, but ${names(dries.map((j) => j.el.name))} should be built with the layers, in the order and of the materials described.`,
			tone: 'caution'
		});
	if (noLimit.length && lt)
		next.push({
			text: `Ask your assessor whether another requirement applies to ${names(noLimit.map((j) => j.el.name))}, for which the limit table sets no limit.`,
			tone: 'none'
		});
	if (noClimate.length)
		next.push({
			text: `Ask your assessor whether ${names(noClimate.map((j) => j.el.name))} should be checked for damp and mould with climate data.`,
			tone: 'none'
		});
	if (!failed.length && !builds.length && !mouldAt.length)
		next.push({
			text: 'Nothing in this assessment calls for a change to the elements assessed.',
			tone: 'pass'
		});
	next.push({
		text: 'Before building work starts, or before you apply for approval, check what your local building codes require with your building control body and a licensed professional.',
		tone: 'none'
	});
	next.push({
		text: 'Keep this report with your home’s papers. It holds only for the construction described; if materials, thicknesses or the order of layers change, ask for a new assessment.',
		tone: 'none'
	});
	if (!doc.draft && doc.verifyUrl && doc.verificationCode)
		next.push({
			text: `You can check that the report is genuine at ${doc.verifyUrl} with the code ${groupCode(doc.verificationCode)}.`,
			tone: 'none'
		});
	return next;
}

/** The one line at the top: the problems, else how well the home did. */
function headlineOf(g: Groups, failing: number, moistureRisk: number): Finding {
	const { coldJunctions, dries, withLimit } = g;
	const problems: string[] = [];
	if (failing)
		problems.push(
			`${countOf(failing, 'element does', 'elements do')} not meet ${failing === 1 ? 'its limit' : 'their limits'}`
		);
	if (moistureRisk)
		problems.push(`${countOf(moistureRisk, 'element has', 'elements have')} a risk of damp or mould`);
	if (coldJunctions.length)
		problems.push(
			`mould may grow where elements meet at ${countOf(coldJunctions.length, 'junction', 'junctions')}`
		);
	return problems.length
		? { text: `${capital(problems.join(' and '))}: see what to do next below.`, tone: 'fail' }
		: dries.length
			? {
					text: `Every element with a limit meets it, and no lasting damp or mould risk was found; some condensation forms and dries out within the year.`,
					tone: 'caution'
				}
			: withLimit.length
				? { text: 'Every element with a limit meets it, and no damp or mould risk was found.', tone: 'pass' }
				: {
						text: 'No damp or mould risk was found; no element has a limit to be judged against.',
						tone: 'none'
					};
}

/**
 * The client's summary of a report. Pure: the same snapshot gives the same words. Works for a dwelling
 * report (every element) and an element report (the one element).
 */
export function clientSummary(s: ClientSummaryInput): ClientSummary {
	const d = s.dwelling;
	const doc = s.document;
	const { judged, failing, moistureRisk } = judge(s.elements);
	const g = groupsOf(s, judged);
	const where = d.address ? `${d.reference}, ${d.address}` : d.reference;
	const assessed = assessedParagraphs(s, judged);
	const heat = heatLossFindings(g);
	const moisture = moistureFindings(g);
	const next = nextSteps(g, doc);
	const headline = headlineOf(g, failing, moistureRisk);

	const intro: string[] = [
		`This summary sets out in plain words the assessment of ${doc.scope === 'element' ? `one element of the home ${where}` : `the home ${where}`}, made by ${s.organisation.name || 'the assessor'}${doc.draft ? '' : `: report ${doc.number}, revision ${doc.revision}, issued on ${longDate(s.issuedAt)}`}.`,
		...(doc.draft ? ['This is a draft. It has not been issued and cannot be checked as genuine.'] : []),
		'The technical pages of the report give the full figures, the methods and their sources.'
	];

	return {
		kicker: 'Summary for the client',
		title:
			doc.scope === 'element'
				? `${judged[0]?.el.name ?? 'Element'} in plain words`
				: `Your home in plain words`,
		headline,
		preparedFor: d.clientName ? `Prepared for ${d.clientName}` : null,
		intro,
		assessed: { heading: 'What was assessed', paragraphs: assessed },
		heatLoss: { heading: 'Heat loss', paragraphs: heat },
		table: {
			columns: {
				name: 'Element',
				kind: 'Kind',
				u: 'Heat loss figure (U-value)',
				limit: 'Limit',
				unit: U_UNIT,
				verdict: 'Against its limit',
				moisture: 'Damp and mould'
			},
			rows: judged.map((j) => ({
				name: j.el.name,
				kind: capital(KIND_WORDS[j.el.kind][0]),
				u: fx(j.el.u, 2),
				limit: j.el.limit === null ? 'none set' : fx(j.el.limit, 2),
				verdict: verdictOf(j),
				moisture: moistureOf(j)
			}))
		},
		moisture: { heading: 'Damp and mould', paragraphs: moisture },
		nextSteps: { heading: 'What to do next', items: next },
		cautions: { heading: 'Please keep in mind', items: CLIENT_CAUTIONS },
		closing:
			'This summary is written for the client. The technical pages of the report are the assessment itself: where the two seem to differ, the technical pages hold.'
	};
}

/** The months of the worst surface checks, in a sentence ("January", "January and December"). */
function monthsOf(list: Judged[]): string {
	const months = [...new Set(list.map((j) => j.el.result!.surface!.criticalMonth))];
	const words = months.map((m) => monthName(m));
	return words.length > 1 ? `${words.slice(0, -1).join(', ')} and ${words[words.length - 1]}` : words[0];
}

/**
 * The cautions in plain words: the calculations are steady-state, the Glaser method's limits, results
 * support and do not replace professional judgement, local codes and a licensed practitioner decide.
 * The technical pages print the full cautions (physics/cautions.ts).
 */
export const CLIENT_CAUTIONS: readonly string[] = [
	'The figures come from standard calculations for steady conditions (a steady-state method): they use fixed temperatures and monthly averages, not the changes of real days, and they treat each element as the same all over, so corners, edges, fixings and openings can behave differently.',
	'The condensation check (the Glaser method) looks only at moisture moving slowly through the materials as vapour. It leaves out rain, water in new materials as they dry, air leaking through gaps and the way some materials soak up and hold water. It shows whether there is a risk; it does not tell how wet the construction will actually be.',
	'These results support, and do not replace, the judgement of a qualified professional.',
	'What your home must meet is set by the local building codes and regulations where you live. Rely on them, and on a licensed practitioner, before you decide on or start any work.'
];
