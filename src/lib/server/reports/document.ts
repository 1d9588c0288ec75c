/**
 * pdfmake document definitions of Envelo's reports: an element report, and a dwelling report made of
 * a summary and one element report per element. Built from a frozen snapshot only: no clock, no
 * database, so the same snapshot gives the same document.
 */
import type { WindowResult } from '$lib/physics/window';
import type { Content, TDocumentDefinitions, CustomTableLayout, TableCell } from 'pdfmake/interfaces';
import { CAUTIONS, type ElementResult, type LayerResult } from '$lib/physics';
import { ELEMENT_KIND_LABELS } from '$lib/dwellings/kinds';
import type { StoredLayer } from '$lib/dwellings/element-input';
import { FONT } from '$lib/server/pdf';
import {
	temperatureChart,
	vapourChart,
	junctionFrame,
	junctionMaterialsPicture,
	junctionTemperaturePicture,
	CHART_COLOURS,
	JUNCTION_LEGEND_HEIGHT,
	type ModelBox
} from './charts';
import { sectionDrawing } from '$lib/dwellings/section';
import { elementDynamics } from '$lib/dwellings/dynamic';
import { sectionCaption, sectionSvg } from '$lib/dwellings/section-svg';
import { fx, trim, pct, monthName, longDate, MONTHS } from '$lib/format';
import {
	condensationNotAssessed,
	elementHeatFlux,
	massBalanceCaution,
	surfaceNotAssessed
} from '$lib/reports/wording';
import {
	groundBranch,
	groundBuildUpResistance,
	methodParagraphs,
	roofSpaceOfResult
} from '$lib/reports/method';
import { DIMENSION_SYSTEMS, DIMENSION_SYSTEM_LABELS, JUNCTION_TYPE_LABELS } from '$lib/junctions/kinds';
import { describeJunctionModel } from '$lib/junctions/describe';
import {
	COMMON_JUNCTION_CAUTIONS,
	COMMON_JUNCTION_METHOD,
	type JunctionCalculation
} from '$lib/junctions/calculate';
import { clientSummary, TONE_WORDS, type Finding, type Tone } from '$lib/reports/client-summary';
import type { ReportSnapshot, SnapshotElement, SnapshotJunction } from './snapshot';

/** "ABCD-EFGH-JK": the code as the screens show it (the verify page takes it with or without dashes). */
export function groupCode(code: string): string {
	return code.replace(/^(.{4})(.{4})(.*)$/, '$1-$2-$3');
}

const INK = CHART_COLOURS.ink;
const SOFT = CHART_COLOURS.soft;
const FAINT = CHART_COLOURS.faint;
const LINE = CHART_COLOURS.line;
const SUNK = '#efeae0';
const PASS = '#25612f';
const CAUTION = '#7a5400';
const FAIL = '#8e1e18';
/** The colour of each tone of a finding (always beside its word), for the PDF and the e-mail. */
export const TONE_COLOURS: Record<Tone, string> = { pass: PASS, caution: CAUTION, fail: FAIL, none: INK };

/** Page size and margins, pt (A4). */
const PAGE_MARGINS: [number, number, number, number] = [50, 64, 50, 60];
const CONTENT_WIDTH = 595.28 - PAGE_MARGINS[0] - PAGE_MARGINS[2];

export const STAGE_LABELS: Record<string, string> = { design: 'Design', 'as-built': 'As built' };
const HEAT_FLOW_LABELS: Record<string, string> = {
	upward: 'upward',
	horizontal: 'horizontal',
	downward: 'downward'
};
const OUTCOME_LABELS: Record<string, string> = {
	none: 'No interstitial condensation in any month',
	dries: 'Condensation forms and evaporates fully within the year',
	accumulates: 'Condensation accumulates: it does not evaporate within the year'
};

/**
 * Short moisture outcome for tables; a check that did not run says why, from the result (a floor on the
 * ground is not assessed for interstitial condensation whatever climate it has).
 */
export function moistureWord(el: SnapshotElement): string {
	const r = el.result;
	if (!r) return el.givenU != null ? 'not assessed' : '—';
	const c = r.condensation;
	const s = r.surface;
	if (!c && !s && !r.ground) return 'no climate';
	const parts: string[] = [];
	if (c)
		parts.push(
			c.outcome === 'none'
				? 'no interstitial condensation'
				: c.outcome === 'dries'
					? 'condenses, dries out within the year'
					: 'condensate accumulates year on year'
		);
	else parts.push(condensationNotAssessed(r)!.short);
	if (s) parts.push(s.pass ? 'surface: no mould risk (fRsi passes)' : 'surface: mould risk (fRsi fails)');
	else if (r.ground) parts.push(`fRsi ${surfaceNotAssessed(r)!.short}`);
	return parts.join('; ');
}

export function passWord(pass: boolean | null): string {
	return pass === null ? 'no limit' : pass ? 'Meets' : 'Exceeds';
}

const rules: CustomTableLayout = {
	hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0.6 : i === 1 ? 0.6 : 0.3),
	vLineWidth: () => 0,
	hLineColor: (i) => (i <= 1 ? SOFT : LINE),
	paddingLeft: (i) => (i === 0 ? 0 : 4),
	paddingRight: (i, node) => (i === (node.table.widths?.length ?? 1) - 1 ? 0 : 4),
	paddingTop: () => 2.2,
	paddingBottom: () => 2.2
};

const keyValue: CustomTableLayout = {
	hLineWidth: (i, node) => (i === 0 || i === node.table.body.length ? 0 : 0.3),
	vLineWidth: () => 0,
	hLineColor: () => LINE,
	paddingLeft: (i) => (i === 0 ? 0 : 6),
	paddingRight: () => 0,
	paddingTop: () => 2,
	paddingBottom: () => 2
};

const panel: CustomTableLayout = {
	hLineWidth: () => 0,
	vLineWidth: () => 0,
	fillColor: () => SUNK,
	paddingLeft: () => 8,
	paddingRight: () => 8,
	paddingTop: () => 6,
	paddingBottom: () => 6
};

function h1(text: string, pre?: string): Content {
	return {
		stack: [...(pre ? [{ text: pre.toUpperCase(), style: 'kicker' }] : []), { text, style: 'h1' }],
		headlineLevel: 1
	} as Content;
}

function h2(num: string, text: string): Content {
	return {
		text: [
			{ text: `${num}  `, color: CHART_COLOURS.heat },
			{ text, color: INK }
		],
		style: 'h2',
		headlineLevel: 2
	} as Content;
}

/** A smaller numbered heading, for the dense junction pages. */
function h3(num: string, text: string): Content {
	return { ...(h2(num, text) as object), style: 'h3' } as Content;
}

/** A heading and the block after it, kept on one page. */
function keep(head: Content, next: Content): Content {
	return { stack: [head, next], unbreakable: true } as Content;
}

/**
 * How a window's or door's U was worked out from its parts (ISO 10077-1): each part with its area, U
 * and, for an edge, its perimeter and ψ, where each value comes from, the total and the method.
 */
function windowPartsSection(r: WindowResult): Content[] {
	const n = (v: number, d: number): TableCell => ({ text: fx(v, d), alignment: 'right' }) as TableCell;
	const body: TableCell[][] = [
		[
			th('Part'),
			th('Area m²', true),
			th('U W/(m²·K)', true),
			th('Edge m', true),
			th('ψ W/(m·K)', true),
			th('Source')
		]
	];
	for (const g of r.glazings)
		body.push([
			g.name,
			n(g.areaM2, 3),
			n(g.uValue, 2),
			n(g.perimeterM, 2),
			n(g.psi, 3),
			`U ${g.uSource}; ψ ${g.psiSource}`
		]);
	for (const f of r.frames) body.push([f.name, n(f.areaM2, 3), n(f.uValue, 2), '', '', `U ${f.uSource}`]);
	for (const p of r.panels)
		body.push([
			p.name,
			n(p.areaM2, 3),
			n(p.uValue, 2),
			n(p.perimeterM, 2),
			n(p.psi, 3),
			`U ${p.uSource}; ψ ${p.psiSource}`
		]);
	body.push([
		{ text: `${r.symbol}, whole ${r.symbol === 'UD' ? 'door' : 'window'}`, bold: true },
		{ text: fx(r.areaM2, 3), bold: true, alignment: 'right' },
		{ text: fx(r.uValue, 3), bold: true, alignment: 'right' },
		'',
		'',
		'unrounded; the given U is this figure to two decimals'
	] as TableCell[]);
	return [
		keep(h2('1a', 'Worked out from its parts (ISO 10077-1)'), {
			table: { headerRows: 1, dontBreakRows: true, widths: ['*', 44, 48, 40, 48, 150], body },
			layout: rules,
			fontSize: 7.5,
			margin: [0, 0, 0, 4]
		} as Content),
		{ ul: [...r.method, ...r.notes, ...r.cautions], fontSize: 8, color: INK, margin: [0, 0, 0, 4] } as Content
	];
}

function kv(rows: [string, string | Content][], widths: (string | number)[] = [118, '*']): Content {
	return {
		table: {
			widths,
			body: rows.map(([k, v]) => [
				{ text: k, color: SOFT },
				typeof v === 'string' ? { text: v } : v
			]) as TableCell[][]
		},
		layout: keyValue
	} as Content;
}

/** Units (and "U-value") that a table heading never splits across lines. */
const UNBROKEN = /(W\/\(m²·K\)|W\/\(m·K\)|m²·K\/W|W\/K|W\/m²|g\/m²|°C|m²|mm|Pa|U-value)/;

/**
 * The pieces of a heading, each unit kept whole (pdfmake's `noWrap` on its piece): a narrow column
 * wraps between words, never inside "m²·K/W". A heading that must wrap at a set place says so with "\n".
 */
export function headingPieces(text: string): { text: string; noWrap?: true }[] {
	return text
		.split(UNBROKEN)
		.filter(Boolean)
		.map((p) => (UNBROKEN.test(p) ? { text: p, noWrap: true as const } : { text: p }));
}

function th(text: string, right = false): TableCell {
	return {
		text: headingPieces(text),
		bold: true,
		color: SOFT,
		fontSize: 7.5,
		alignment: right ? 'right' : 'left'
	} as TableCell;
}

function num(text: string): TableCell {
	return { text, alignment: 'right' } as TableCell;
}

function verdict(pass: boolean | null, yes: string, no: string, none = 'no limit set'): Content {
	if (pass === null) return { text: none, color: SOFT } as Content;
	return { text: pass ? yes : no, bold: true, color: pass ? PASS : FAIL } as Content;
}

/* ---------------------------------------------------------------- the parts */

function identity(s: ReportSnapshot, el: SnapshotElement | null): Content {
	const d = s.dwelling;
	const doc = s.document;
	const a = d.assessor;
	const rows: [string, string][] = [
		['Dwelling', [d.reference, d.address].filter(Boolean).join(' — ')],
		...(d.programme ? ([['Programme', d.programme]] as [string, string][]) : []),
		['Client', [d.clientName, d.clientEmail ? `<${d.clientEmail}>` : null].filter(Boolean).join(' ') || '—'],
		['Stage', STAGE_LABELS[d.stage] ?? d.stage],
		...(el
			? ([
					['Element', `${el.name} (${ELEMENT_KIND_LABELS[el.kind] ?? el.kind})`],
					['Area', `${fx(el.area, 2)} m²`]
				] as [string, string][])
			: []),
		[
			'Assessor',
			a
				? `${a.name}${a.registrationNumber ? `, registration no. ${a.registrationNumber}` : ', no registration number recorded'}`
				: '—'
		],
		[doc.draft ? 'Printed' : 'Date of issue', longDate(s.issuedAt)],
		[
			'Report',
			doc.draft
				? 'Draft — not issued, not verifiable'
				: `${doc.number}, revision ${doc.revision}${doc.supersedes ? ` (supersedes revision ${doc.supersedes.revision} of ${longDate(doc.supersedes.issuedAt)})` : ''}`
		],
		['Calculation engine', `Envelo ${s.engineVersion}`]
	];
	return kv(rows);
}

/** The construction in words, from inside to outside. */
export function constructionInWords(el: SnapshotElement): string {
	const layers = el.buildUp?.layers ?? [];
	if (!layers.length) return 'No build-up is recorded.';
	const phrase = (l: StoredLayer) => {
		const name = l.name || 'unnamed layer';
		if (l.air) {
			const kind =
				l.air === 'unventilated'
					? 'unventilated'
					: l.air === 'slightly-ventilated'
						? 'slightly ventilated'
						: 'well-ventilated';
			return `a ${trim(l.thicknessMm, 1)} mm ${kind} air layer${name && !/air/i.test(name) ? ` (${name})` : ''}`;
		}
		let s = `${trim(l.thicknessMm, 1)} mm ${name}`;
		if (l.bridge) {
			const what = l.bridge.name || 'bridging members';
			const g = l.bridgeGeometry;
			s += g
				? ` between ${what} ${trim(g.widthMm, 1)} mm wide at ${trim(g.centresMm, 0)} mm centres`
				: ` bridged by ${what} (${pct(l.bridge.fraction ?? 0, 1)} of the area)`;
		}
		return s;
	};
	const parts = layers.map(phrase);
	const last =
		parts.length > 1 ? `${parts.slice(0, -1).join(', ')} and ${parts[parts.length - 1]}` : parts[0];
	const total = layers.reduce((t, l) => t + l.thicknessMm, 0);
	return `From inside to outside: ${last}. Overall thickness ${trim(total, 1)} mm; heat flow ${HEAT_FLOW_LABELS[el.heatFlow] ?? el.heatFlow}.`;
}

function layerTable(el: SnapshotElement, r: ElementResult): Content {
	const stored = el.buildUp?.layers ?? [];
	const revs = new Map(el.materialRevisions.map((m) => [m.layerIndex, m]));
	const body: TableCell[][] = [
		[
			th('#'),
			th('Layer and source of values'),
			th('d, mm', true),
			th('λ W/(m·K)\nor R m²·K/W', true),
			th('μ or sd', true),
			th('R, m²·K/W', true),
			th('Bridging')
		]
	];
	r.layers.forEach((lr: LayerResult, i) => {
		const l = stored[i] ?? ({} as StoredLayer);
		const rev = revs.get(i);
		const sourceBits: string[] = [];
		if (rev) {
			sourceBits.push(`library ${rev.code ?? ''} rev. ${rev.revision}`.replace('  ', ' '));
			if (rev.lambdaKind) sourceBits.push(`${rev.lambdaKind} λ`);
			if (rev.source) sourceBits.push(rev.source);
		} else if (l.air) {
			sourceBits.push('air layer, ISO 6946:2017 6.9');
		} else {
			sourceBits.push('entered for this element');
		}
		let thermal: string;
		if (l.air)
			thermal = l.resistance !== undefined ? `R ${trim(l.resistance, 3)} (given)` : 'R from ISO 6946';
		else if (l.lambda !== undefined) thermal = `λ ${trim(l.lambda, 4)}`;
		else thermal = `R ${trim(l.resistance, 3)}`;
		const vapour =
			l.sd !== undefined
				? `sd ${trim(l.sd, 3)} m`
				: l.mu !== undefined
					? `μ ${trim(l.mu, 1)}`
					: l.air
						? 'μ 1'
						: '—';
		let bridging = '—';
		if (l.bridge) {
			const g = l.bridgeGeometry;
			bridging = `${l.bridge.name ? l.bridge.name + ', ' : ''}λ ${trim(l.bridge.lambda, 3)}, ${pct(lr.bridgeFraction ?? l.bridge.fraction ?? 0, 1)}${g ? ` (${trim(g.widthMm, 1)} mm at ${trim(g.centresMm, 0)} mm centres)` : ''}`;
		}
		const faded = lr.disregarded ? { color: FAINT } : {};
		body.push([
			{ text: String(i + 1), ...faded },
			{
				stack: [
					{ text: lr.name || l.name || '—', ...faded },
					{
						text:
							sourceBits.join(' · ') +
							(lr.disregarded ? ' · disregarded (outside a well-ventilated air layer)' : ''),
						fontSize: 6.8,
						color: FAINT
					}
				]
			},
			{ ...(num(trim(lr.thicknessMm, 1)) as object), ...faded } as TableCell,
			{ ...(num(thermal) as object), ...faded } as TableCell,
			{ ...(num(vapour) as object), ...faded } as TableCell,
			{ ...(num(fx(lr.r, 3)) as object), ...faded } as TableCell,
			{ text: bridging, fontSize: 7.2, ...faded }
		] as TableCell[]);
	});
	return {
		table: { headerRows: 1, dontBreakRows: true, widths: [12, '*', 36, 66, 48, 44, 108], body },
		layout: rules,
		fontSize: 8
	} as Content;
}

/** The method actually used (methodParagraphs), then surface resistances, corrections and rounding. */
function methodStatement(r: ElementResult): Content {
	const paras: string[] = methodParagraphs(r);
	paras.push(`Surface resistances used: Rsi = ${fx(r.rsi, 2)} m²·K/W and Rse = ${fx(r.rse, 2)} m²·K/W.`);
	if (r.deltaUAirGaps > 0 || r.deltaUFasteners > 0) {
		paras.push(
			r.correctionsApplied
				? `Corrections (ISO 6946:2017, Annex F): ΔU for air gaps ${fx(r.deltaUAirGaps, 4)} and for mechanical fasteners ${fx(r.deltaUFasteners, 4)} W/(m²·K) are applied, ΔU = ${fx(r.deltaU, 4)} W/(m²·K).`
				: `Corrections (ISO 6946:2017, Annex F): ΔU = ${fx(r.deltaUAirGaps + r.deltaUFasteners, 4)} W/(m²·K) is below 3 % of U and is omitted, as the standard allows.`
		);
	} else {
		paras.push(
			'Corrections (ISO 6946:2017, Annex F): no air-gap or fastener correction applies to this build-up (ΔU = 0).'
		);
	}
	paras.push(r.roundingConvention);
	return { stack: paras.map((p) => ({ text: p, margin: [0, 0, 0, 3] })) } as Content;
}

function thermalTable(el: SnapshotElement, r: ElementResult, s: ReportSnapshot): Content {
	const rows: [string, string | Content][] = [];
	rows.push(['Rsi, Rse', `${fx(r.rsi, 2)} and ${fx(r.rse, 2)} m²·K/W`]);
	const roof = roofSpaceOfResult(r);
	if (roof) rows.push(['Roof space Ru', `${fx(roof.ru, 2)} m²·K/W (${roof.source})`]);
	if (r.unheatedSpace)
		rows.push(['Unheated space Ru', `${fx(r.unheatedSpace.ru, 4)} m²·K/W (${r.unheatedSpace.method})`]);
	if (r.rUpper !== undefined && r.rLower !== undefined) {
		rows.push(['Upper limit R′T', `${fx(r.rUpper, 3)} m²·K/W`]);
		rows.push(['Lower limit R″T', `${fx(r.rLower, 3)} m²·K/W`]);
	}
	const g = r.ground;
	if (g) {
		// ISO 13370: the build-up's own RT, then the ground's figures and the floor's equivalent 1/U.
		rows.push(['Build-up RT = Rsi + ΣR + Rse', `${fx(groundBuildUpResistance(r), 3)} m²·K/W`]);
		if (r.relativeError !== undefined) rows.push(['Maximum relative error e', pct(r.relativeError, 1)]);
		rows.push([
			'Characteristic dimension B′',
			`${fx(g.characteristicDimensionM, 2)} m (A ${trim(g.areaM2, 2)} m², exposed perimeter P ${trim(g.perimeterM, 2)} m)`
		]);
		rows.push([
			'Equivalent thickness dt',
			`${fx(g.equivalentThicknessM, 3)} m (w ${fx(g.wallThicknessM, 2)} m, λg ${fx(g.groundLambda, 2)} W/(m·K))`
		]);
		rows.push([
			'Formula (ISO 13370)',
			g.suspended
				? 'suspended floor: U = 1/(1/Uf + 1/(Ug + Ux))'
				: g.basement?.kind === 'heated'
					? `heated basement: U′ = (A·Ubf + z·P·Ubw)/(A + z·P), Ubf ${fx(g.basement.ubf, 4)}, Ubw ${fx(g.basement.ubw, 4)} W/(m²·K)`
					: g.basement
						? `unheated basement: 1/U = 1/Uf + A/(A·Ubf + z·P·Ubw + h·P·Uw + 0.33·n·V), Uf ${fx(g.basement.floorU ?? 0, 4)}, Ubf ${fx(g.basement.ubf, 4)}, Ubw ${fx(g.basement.ubw, 4)} W/(m²·K)`
						: g.edge
							? `edge insulation: U = U0 + 2·Δψ/B′, U0 ${fx(g.edge.u0, 4)} W/(m²·K), Δψ ${fx(g.edge.deltaPsi, 4)} W/(m·K)`
							: groundBranch(g) === 'dt < B′'
								? 'dt < B′: U = 2λg/(π·B′ + dt)·ln(π·B′/dt + 1)'
								: 'dt ≥ B′: U = λg/(0.457·B′ + dt)'
		]);
		rows.push([
			'Equivalent resistance 1/U',
			`${fx(r.rTotal, 3)} m²·K/W (the ground adds ${fx(g.rGround, 3)} m²·K/W)`
		]);
	} else {
		rows.push(['Total resistance RT', `${fx(r.rTotal, 3)} m²·K/W`]);
		if (r.relativeError !== undefined) rows.push(['Maximum relative error e', pct(r.relativeError, 1)]);
	}
	rows.push(['U before corrections', `${fx(r.uUncorrected, 4)} W/(m²·K)`]);
	rows.push([
		'ΔU',
		`${fx(r.deltaU, 4)} W/(m²·K)${r.correctionsApplied ? ' (applied)' : r.deltaUAirGaps + r.deltaUFasteners > 0 ? ' (omitted, below 3 % of U)' : ''}`
	]);
	rows.push(['U, unrounded', `${fx(r.uValue, 4)} W/(m²·K)`]);
	rows.push(['U-value', { text: `${fx(r.uValueRounded, 2)} W/(m²·K)`, bold: true } as Content]);
	const lt = s.limitTable;
	rows.push([
		'Limit compared with',
		el.limit !== null && lt
			? `${fx(el.limit, 2)} W/(m²·K) — ${lt.name}, ${lt.edition}${lt.dated ? ` (${longDate(lt.dated)})` : ''}${lt.source ? `; ${lt.source}` : ''}`
			: 'no limit for this kind of element in the limit table'
	]);
	rows.push(['Result', verdict(el.pass, 'Meets the limit (U ≤ limit)', 'Exceeds the limit (U > limit)')]);
	return kv(rows, [130, '*']);
}

function resultPanel(el: SnapshotElement, s: ReportSnapshot): Content {
	const r = el.result;
	const cells: Content[] = [];
	const big = (label: string, value: string, sub: Content) =>
		({
			stack: [
				{ text: label, fontSize: 7.5, color: SOFT },
				{ text: value, fontSize: 15, bold: true, margin: [0, 1, 0, 1] },
				sub
			]
		}) as Content;
	const u = el.u;
	cells.push(
		big('U-value, W/(m²·K)', fx(u, 2), {
			text: r
				? r.ground
					? `build-up RT ${fx(groundBuildUpResistance(r), 3)} · 1/U ${fx(r.rTotal, 3)} m²·K/W`
					: `RT ${fx(r.rTotal, 3)} m²·K/W`
				: `given: ${el.givenUSource ?? 'source not recorded'}`,
			fontSize: 7.5,
			color: SOFT
		} as Content)
	);
	cells.push(
		big('Limit, W/(m²·K)', el.limit === null ? '—' : fx(el.limit, 2), {
			text: [
				verdict(el.pass, 'Meets the limit', 'Exceeds the limit'),
				s.limitTable ? { text: ` · ${s.limitTable.name}, ${s.limitTable.edition}`, color: SOFT } : ''
			],
			fontSize: 7.5
		} as Content)
	);
	const c = r?.condensation;
	cells.push(
		big(
			'Interstitial condensation',
			c ? (c.outcome === 'none' ? 'None' : c.outcome === 'dries' ? 'Dries out' : 'Accumulates') : '—',
			{
				text: c
					? c.outcome === 'none'
						? 'in no month'
						: `peak ${fx(c.maxAccumulation, 1)} g/m² in ${monthName(c.peakMonth)}`
					: r
						? condensationNotAssessed(r)!.short
						: 'not assessed',
				fontSize: 7.5,
				color: c ? (c.outcome === 'accumulates' ? FAIL : c.outcome === 'dries' ? CAUTION : PASS) : SOFT
			} as Content
		)
	);
	const sf = r?.surface;
	cells.push(
		big('Surface humidity fRsi', sf ? fx(sf.fRsi, 3) : '—', {
			text: sf
				? [
						{ text: sf.pass ? 'Passes' : 'Fails', bold: true, color: sf.pass ? PASS : FAIL },
						{ text: ` · fRsi,min ${fx(sf.fRsiMin, 3)} (${monthName(sf.criticalMonth)})`, color: SOFT }
					]
				: r
					? surfaceNotAssessed(r)!.short
					: 'not assessed',
			fontSize: 7.5,
			color: SOFT
		} as Content)
	);
	return {
		table: { widths: ['*', '*', '*', '*'], body: [cells as TableCell[]] },
		layout: panel,
		margin: [0, 6, 0, 4]
	} as Content;
}

function climateTable(el: SnapshotElement, r: ElementResult): Content[] {
	const out: Content[] = [];
	const i = el.internal;
	const internal = i
		? `${fx(i.temperature, 1)} °C, ${i.humidityClass !== undefined ? `humidity class ${i.humidityClass} (ISO 13788:2012, Annex A)` : i.relativeHumidity !== undefined ? `${fx(i.relativeHumidity, 0)} % relative humidity in every month` : 'humidity not given'}`
		: `not recorded; ${fx(r.designTemperatures.internal, 1)} °C used for the profile`;
	const cl = el.climate;
	out.push(
		kv([
			['Internal conditions', internal],
			[
				'Design temperatures',
				`θi ${fx(r.designTemperatures.internal, 1)} °C, θe ${fx(r.designTemperatures.external, 1)} °C (temperature profile)`
			],
			[
				'Climate',
				cl
					? `${cl.name}${cl.illustrative ? ' (illustrative data, not for compliance)' : ''}`
					: 'none attached: moisture checks not run'
			],
			...(cl ? ([['Source of the climate', cl.source]] as [string, string][]) : [])
		])
	);
	if (cl && cl.months.length === 12) {
		const sorted = [...cl.months].sort((a, b) => a.month - b.month);
		const c = r.condensation;
		const piByMonth = new Map(c?.months.map((m) => [m.month, m]) ?? []);
		const fByMonth = new Map(r.surface?.months.map((m) => [m.month, m]) ?? []);
		const row = (label: string, f: (m: (typeof sorted)[number]) => string): TableCell[] => [
			{ text: label, color: SOFT } as TableCell,
			...sorted.map((m) => num(f(m)))
		];
		const body: TableCell[][] = [
			[th(''), ...MONTHS.map((m) => th(m, true))],
			row('θe, °C', (m) => fx(m.temperature, 1)),
			row('φe, %', (m) => fx(m.relativeHumidity, 0))
		];
		if (c) {
			body.push(row('pe, Pa', (m) => fx(piByMonth.get(m.month)?.externalVapourPressure, 0)));
			body.push(row('pi, Pa', (m) => fx(piByMonth.get(m.month)?.internalVapourPressure, 0)));
		}
		let noRisk = false;
		if (r.surface)
			body.push(
				row('fRsi,min', (m) => {
					const f = fByMonth.get(m.month);
					if (!f || f.fRsiMin === null || f.minSurfaceTemperature === null) {
						noRisk = true;
						return '—';
					}
					if (f.externalTemperature >= f.minSurfaceTemperature) {
						noRisk = true;
						return '—';
					}
					return fx(f.fRsiMin, 3);
				})
			);
		out.push({
			table: { headerRows: 1, widths: [44, ...MONTHS.map(() => '*')], body },
			layout: rules,
			fontSize: 7.2,
			margin: [0, 6, 0, 0]
		} as Content);
		if (noRisk)
			out.push({
				text: 'fRsi,min “—”: no surface mould risk arises in that month, because the mean outside temperature θe is at or above θsi,min, the lowest acceptable internal surface temperature (at which the surface would reach 80 % relative humidity), or no heat flows outwards; no temperature factor is needed.',
				fontSize: 7.2,
				color: SOFT,
				margin: [0, 2, 0, 0]
			} as Content);
	}
	return out;
}

function nodeLabel(r: ElementResult, nodeIndex: number): { head: string; sub: string } {
	const c = r.condensation!;
	const n = c.nodes[nodeIndex];
	const layer = (i: number) => r.layers[i]?.name ?? `layer ${i + 1}`;
	if (n.kind === 'interface') {
		return {
			head: `${trim(n.positionMm, 1)} mm`,
			sub: `${n.layerIndex + 1}|${n.layerIndex + 2}: ${layer(n.layerIndex)} / ${layer(n.layerIndex + 1)}`
		};
	}
	if (n.kind === 'external-surface') return { head: `${trim(n.positionMm, 1)} mm`, sub: 'external surface' };
	if (n.kind === 'internal-surface') return { head: '0 mm', sub: 'internal surface' };
	return { head: `${trim(n.positionMm, 1)} mm`, sub: `within ${n.layerIndex + 1}: ${layer(n.layerIndex)}` };
}

/** Most interface columns the monthly table shows; the rest are summarised under it. */
const MAX_INTERFACE_COLUMNS = 4;

/** The moisture criteria the element is judged by, named with their clauses. */
function criteriaApplied(el: SnapshotElement, r: ElementResult): string {
	const limits = el.input?.moistureLimits ?? {};
	const list: string[] = [];
	if (r.surface)
		list.push(
			'no surface mould risk: fRsi > fRsi,min in every month, from 80 % relative humidity at the internal surface (ISO 13788:2012, clause 5)'
		);
	if ((limits.requireEvaporation ?? true) && r.condensation)
		list.push(
			'no net annual accumulation of interstitial condensate: all of it evaporates within the yearly cycle (Glaser method, ISO 13788:2012, clause 6)'
		);
	if (limits.maxAtInterfaceGm2 !== undefined)
		list.push(`at most ${trim(limits.maxAtInterfaceGm2, 1)} g/m² of condensate at any one position`);
	if (limits.maxTotalGm2 !== undefined)
		list.push(`at most ${trim(limits.maxTotalGm2, 1)} g/m² of condensate in total`);
	return list.length ? list.map((t, i) => `${i + 1}. ${t}`).join('\n') : 'none';
}

/** Passes or fails the criteria above, saying which and why. */
function acceptanceVerdict(r: ElementResult): Content {
	const reasons = [...(r.condensation?.acceptance.reasons ?? [])];
	if (r.surface && !r.surface.pass)
		reasons.unshift(
			`fRsi ${fx(r.surface.fRsi, 3)} ≤ fRsi,min ${fx(r.surface.fRsiMin, 3)} (${monthName(r.surface.criticalMonth)}): risk of mould growth at the surface`
		);
	if (reasons.length) return { text: `Fails: ${reasons.join('; ')}`, color: FAIL, bold: true } as Content;
	const c = r.condensation;
	const dries = c?.outcome === 'dries';
	return {
		text: [
			{ text: 'Passes the criteria above', bold: true, color: PASS },
			dries
				? {
						text: ': condensate forms in some months but evaporates fully within the year.',
						color: CAUTION
					}
				: { text: '.', color: PASS }
		]
	} as Content;
}

function condensationPart(el: SnapshotElement, r: ElementResult): Content[] {
	const c = r.condensation;
	if (!c) return [{ text: condensationNotAssessed(r)!.sentence, color: SOFT } as Content];
	const out: Content[] = [];
	const peakAt = c.nodes.map((_, i) => Math.max(0, ...c.months.map((m) => m.accumulatedAt[i] ?? 0)));
	const wet = peakAt.map((p, i) => ({ p, i })).filter((x) => x.p > 1e-6);
	const shown = [...wet]
		.sort((a, b) => b.p - a.p)
		.slice(0, MAX_INTERFACE_COLUMNS)
		.sort((a, b) => a.i - b.i);
	const labels = shown.map((x) => nodeLabel(r, x.i));
	const head: TableCell[] = [
		th('Month'),
		th('θe °C', true),
		th('pe Pa', true),
		th('pi Pa', true),
		...labels.map(
			(l) =>
				({
					stack: [
						{ text: `at ${l.head}`, bold: true },
						{ text: l.sub, fontSize: 6.2 }
					],
					color: SOFT,
					fontSize: 7.2,
					alignment: 'right'
				}) as TableCell
		),
		th('Formed g/m²', true),
		th('Evaporated g/m²', true),
		th('Total at month end g/m²', true)
	];
	const body: TableCell[][] = [head];
	const order = c.startMonth
		? [...c.months].sort(
				(a, b) => ((a.month - c.startMonth! + 12) % 12) - ((b.month - c.startMonth! + 12) % 12)
			)
		: c.months;
	for (const m of order) {
		body.push([
			{ text: MONTHS[m.month - 1], bold: m.month === c.peakMonth } as TableCell,
			num(fx(m.externalTemperature, 1)),
			num(fx(m.externalVapourPressure, 0)),
			num(fx(m.internalVapourPressure, 0)),
			...shown.map((x) => num(fx(m.accumulatedAt[x.i] ?? 0, 1))),
			num(fx(m.condensed, 1)),
			num(fx(m.evaporated, 1)),
			{ text: fx(m.accumulated, 1), alignment: 'right', bold: m.month === c.peakMonth } as TableCell
		]);
	}
	if (wet.length === 0) {
		out.push({
			text: 'No condensation forms at any interface in any month, so the monthly amounts are all zero.',
			margin: [0, 0, 0, 4]
		} as Content);
	}
	out.push({
		table: {
			headerRows: 1,
			dontBreakRows: true,
			widths: ['*', 34, 34, 34, ...shown.map(() => 58), 46, 52, 60],
			body
		},
		layout: rules,
		fontSize: 7.5
	} as Content);
	if (wet.length > shown.length) {
		out.push({
			text: `${wet.length - shown.length} further condensation position(s) with smaller amounts are included in the totals.`,
			fontSize: 7.2,
			color: SOFT,
			margin: [0, 2, 0, 0]
		} as Content);
	}
	out.push({
		text: `Months are listed from the start of the cycle${c.startMonth ? ` (${monthName(c.startMonth)})` : ''}; amounts are per m² of element. The month of the peak is set in bold.`,
		fontSize: 7.2,
		color: SOFT,
		margin: [0, 2, 0, 6]
	} as Content);
	const rows: [string, string | Content][] = [
		[
			'Outcome',
			{
				text: OUTCOME_LABELS[c.outcome],
				bold: true,
				color: c.outcome === 'none' ? PASS : c.outcome === 'dries' ? CAUTION : FAIL
			} as Content
		],
		[
			'Months with condensation',
			c.condensationMonths.length ? c.condensationMonths.map((m) => MONTHS[m - 1]).join(', ') : 'none'
		],
		[
			'Peak amount',
			c.outcome === 'none'
				? '0 g/m²'
				: `${fx(c.maxAccumulation, 1)} g/m² in total at the end of ${monthName(c.peakMonth)}; at most ${fx(c.maxAtInterface, 1)} g/m² at one position${c.maxAtInterfaceNode !== null ? ` (${nodeLabel(r, c.maxAtInterfaceNode).head}, ${nodeLabel(r, c.maxAtInterfaceNode).sub})` : ''}`
		],
		['Dries out within the year', c.outcome === 'none' ? 'not applicable' : c.evaporatesFully ? 'yes' : 'no'],
		['Criteria applied', criteriaApplied(el, r)],
		['Acceptance', acceptanceVerdict(r)]
	];
	if (c.surfaceCondensationMonths.length) {
		rows.push([
			'Surface condensation',
			`predicted at the internal surface in ${c.surfaceCondensationMonths.map((m) => MONTHS[m - 1]).join(', ')} (outside the Glaser method)`
		]);
	}
	out.push(kv(rows, [130, '*']));
	const caution = massBalanceCaution(c);
	if (caution) out.push(massBalanceBlock(caution));
	return out;
}

/** The caution that the monthly method created moisture, with both years' figures side by side. */
function massBalanceBlock(caution: NonNullable<ReturnType<typeof massBalanceCaution>>): Content {
	const body: TableCell[][] = [
		[th(''), th(caution.standardHeading), th(caution.conservingHeading)],
		...caution.rows.map((row) => [
			{ text: row.label, color: SOFT } as TableCell,
			row.standard,
			row.conserving
		])
	];
	return {
		stack: [
			{ text: caution.heading, bold: true, color: CAUTION, margin: [0, 0, 0, 2] },
			{ text: caution.text, margin: [0, 0, 0, 4] },
			{ table: { headerRows: 1, widths: [130, '*', '*'], body }, layout: rules, fontSize: 8 }
		],
		unbreakable: true,
		margin: [0, 6, 0, 0]
	} as Content;
}

function surfacePart(r: ElementResult): Content {
	const s = r.surface;
	if (!s) return { text: surfaceNotAssessed(r)!.sentence, color: SOFT } as Content;
	const rows: [string, string | Content][] = [
		['fRsi of the element', `${fx(s.fRsi, 3)} (with Rsi = ${fx(s.rsiUsed, 2)} m²·K/W for this check)`],
		[
			'fRsi,min',
			`${fx(s.fRsiMin, 3)}, in the critical month ${monthName(s.criticalMonth)} (80 % surface relative humidity, ISO 13788:2012 clause 5)`
		],
		[
			'Result',
			verdict(
				s.pass,
				'Passes: fRsi > fRsi,min',
				'Fails: fRsi ≤ fRsi,min — risk of mould growth at the surface'
			)
		]
	];
	if (s.fRsiLowestSection !== undefined) {
		rows.push([
			'Across the bridging',
			`fRsi ${fx(s.fRsiLowestSection, 3)} for the section with the lowest resistance (one-dimensional estimate)`
		]);
	}
	return kv(rows, [130, '*']);
}

function assumptions(el: SnapshotElement, r: ElementResult | null): Content {
	const items: string[] = [];
	const bridged = (el.input?.layers ?? []).some((l) => l.bridge);
	items.push(
		bridged
			? 'Each layer is taken as continuous over the element area except the bridged layers, where the bridging members (studs, joists, rafters) take the fraction of the area stated and the combined method applies; thicknesses and material values as listed, values from the library copied from the revision named beside each layer.'
			: 'Every layer is taken as continuous over the element area, with the thickness and material values listed; values from the library are copied from the revision named beside each layer.'
	);
	items.push(
		'Internal conditions are constant through the year; external conditions are the monthly means of the climate stated.'
	);
	if (r) {
		for (const n of r.notes) items.push(n);
		for (const w of r.warnings) items.push(`Warning: ${w}`);
		// Unusual inputs (engine 1.3.0 on): reasons to look, never refusals; the figures are as entered.
		for (const p of r.plausibility ?? []) items.push(`Plausibility: ${p.message} (${p.source})`);
	}
	if (el.givenU != null)
		items.push(`The U-value is given, not calculated: ${el.givenUSource ?? 'source not recorded'}.`);
	return { ul: items, fontSize: 8, color: INK, margin: [0, 0, 0, 2] } as Content;
}

export function cautionsBlock(validity: boolean): Content {
	return {
		stack: [
			...(validity
				? [
						{
							text: VALIDITY_STATEMENT,
							bold: true,
							margin: [0, 0, 0, 4]
						}
					]
				: []),
			{ ul: [...CAUTIONS], fontSize: 7.8, color: SOFT }
		]
	} as Content;
}

/** The validity statement printed beside the declaration. */
export const VALIDITY_STATEMENT =
	'This result is valid only for the construction described in this report, built as described, under the conditions stated. Any change of material, thickness, order of layers, bridging or conditions needs a new calculation.';

/**
 * The assessor's declaration: who carried out the assessment, their registration number, the date of
 * issue, what it rests on, and an empty line for the signature; the validity statement beside it.
 * The declarant is the person who issued the report, as frozen at issue (`document.issuedBy`), never
 * the dwelling's assessor field; only a snapshot frozen before the issuer's registration number was
 * recorded prints the assessor, so that it renders as it was issued.
 */
export function declarationBlock(s: ReportSnapshot, num: string | null): Content {
	const d = s.document;
	const by = d.issuedBy;
	const a = by && 'registrationNumber' in by ? by : s.dwelling.assessor;
	const name = a?.name ?? 'no assessor assigned';
	const reg = a?.registrationNumber ?? 'not recorded';
	const what =
		d.scope === 'dwelling'
			? `dwelling ${s.dwelling.reference}${s.dwelling.address ? `, ${s.dwelling.address}` : ''}`
			: `the element "${s.elements[0]?.name ?? ''}" of dwelling ${s.dwelling.reference}`;
	const line = (label: string, width: number) =>
		({
			stack: [
				{
					canvas: [{ type: 'line', x1: 0, y1: 0, x2: width, y2: 0, lineWidth: 0.6, lineColor: SOFT }],
					margin: [0, 26, 0, 2]
				},
				{ text: label, fontSize: 7.5, color: SOFT }
			],
			width
		}) as Content;
	return {
		stack: [
			...(num ? [h2(num, 'Declaration')] : []),
			{
				text: `I declare that I carried out the assessment in this report of ${what} myself, on the information described in it: the build-ups and their sources, the areas, ${s.junctions?.length ? 'the junctions, their lengths and the sources of entered ψ-values, ' : ''}the internal conditions, the climate and the limit table stated, with the calculation engine and the methods named. Its results support, and do not replace, professional judgement.`,
				margin: [0, 0, 0, 6]
			},
			kv([
				['Assessor', name],
				['Registration number', reg],
				[
					'Date of issue',
					d.draft ? `not issued (draft printed ${longDate(s.issuedAt)})` : longDate(s.issuedAt)
				],
				['Report', d.draft ? 'Draft — not issued, not to be signed' : `${d.number}, revision ${d.revision}`]
			]),
			{
				columns: [line('Signature of the assessor', 230), { text: '', width: '*' }, line('Date', 120)],
				margin: [0, 0, 0, 8]
			},
			{ text: VALIDITY_STATEMENT, bold: true }
		],
		unbreakable: true
	} as Content;
}

function chart(svg: string | null, caption: string): Content[] {
	if (!svg) return [];
	return [
		{ svg, width: CONTENT_WIDTH, font: FONT, margin: [0, 4, 0, 0] } as unknown as Content,
		{ text: caption, fontSize: 7.2, color: SOFT, margin: [0, 1, 0, 6] } as Content
	];
}

/**
 * The element's heat storage (ISO 13786, 24-hour period) when its layers carry density and specific
 * heat, as the element page shows it; nothing when they do not (the page says what is missing).
 */
function heatStorageBlock(el: SnapshotElement, r: ElementResult): Content | null {
	if (!el.buildUp) return null;
	const d = elementDynamics(el.buildUp, r);
	if (!d.ok) return null;
	const v = d.value;
	return {
		stack: [
			{ text: 'Heat storage (ISO 13786:2017, 24-hour period)', bold: true, margin: [0, 6, 0, 2] },
			kv([
				['Areal heat capacity κ1 (inside)', `${fx(v.kappa1, 1)} kJ/(m²·K)`],
				['Areal heat capacity κ2 (outside)', `${fx(v.kappa2, 1)} kJ/(m²·K)`],
				['Decrement factor f', fx(v.decrementFactor, 3)],
				[
					'Periodic transmittance |Y12|',
					`${fx(v.y12.modulus, 3)} W/(m²·K), time shift ${fx(v.y12.timeLagH, 1)} h`
				]
			]),
			{
				text: `${v.method[0]} ${v.cautions[0]}`,
				fontSize: 7.2,
				color: SOFT,
				margin: [0, 2, 0, 0]
			}
		],
		unbreakable: true
	} as Content;
}

/** The full element report for one element of the snapshot. */
export function elementSection(
	s: ReportSnapshot,
	el: SnapshotElement,
	position: { index: number; of: number } | null
): Content[] {
	const kicker = position ? `Element ${position.index + 1} of ${position.of}` : 'Element report';
	const out: Content[] = [h1(el.name, `${kicker} · ${ELEMENT_KIND_LABELS[el.kind] ?? el.kind}`)];
	out.push(identity(s, el));
	out.push(resultPanel(el, s));
	const r = el.result;
	if (!r) {
		out.push(
			keep(
				h2('1', 'Given U-value'),
				kv([
					['U-value', `${fx(el.givenU ?? null, 2)} W/(m²·K)`],
					['Source', el.givenUSource ?? 'not recorded'],
					[
						'Limit compared with',
						el.limit !== null && s.limitTable
							? `${fx(el.limit, 2)} W/(m²·K) — ${s.limitTable.name}, ${s.limitTable.edition}`
							: 'no limit for this kind of element'
					],
					['Result', verdict(el.pass, 'Meets the limit (U ≤ limit)', 'Exceeds the limit (U > limit)')]
				])
			)
		);
		out.push({
			text: 'No build-up calculation and no moisture check are made for an element with a given U-value.',
			color: SOFT,
			margin: [0, 4, 0, 0]
		} as Content);
		if (el.windowParts) out.push(...windowPartsSection(el.windowParts.result));
		out.push(keep(h2('2', 'Assumptions, validity and cautions'), assumptions(el, null)));
		out.push(cautionsBlock(s.document.scope !== 'element'));
		if (s.document.scope === 'element') out.push(declarationBlock(s, '3'));
		return out;
	}
	out.push(keep(h2('1', 'Construction'), { text: constructionInWords(el), margin: [0, 0, 0, 4] } as Content));
	out.push(layerTable(el, r));
	if (el.input) {
		// the build-up drawn to scale, as the element page shows it
		const drawing = sectionDrawing(el.input, r);
		out.push({
			stack: chart(
				sectionSvg(drawing, { id: `s${el.id}`, width: 640, fontFamily: FONT }),
				sectionCaption(drawing)
			),
			unbreakable: true
		} as Content);
	}
	out.push(keep(h2('2', 'Method'), methodStatement(r)));
	out.push(keep(h2('3', 'Thermal resistance, U-value and limit'), thermalTable(el, r, s)));
	const storage = heatStorageBlock(el, r);
	if (storage) out.push(storage);
	out.push({
		stack: [
			h2('4', 'Temperature through the build-up'),
			...chart(
				temperatureChart(r, CONTENT_WIDTH, 190),
				`Steady state at θi ${fx(r.designTemperatures.internal, 1)} °C and θe ${fx(r.designTemperatures.external, 1)} °C; layers numbered as in the layer table${r.layers.some((l) => l.bridgeFraction !== undefined) ? ', bridged layers shaded darker (profile through the main material)' : ''}. ${elementHeatFlux(r).sentence}`
			)
		],
		unbreakable: true
	} as Content);
	const [conditions, ...months] = climateTable(el, r);
	out.push(keep(h2('5', 'Internal conditions and climate'), conditions));
	out.push(...months);
	const vchart = vapourChart(r, CONTENT_WIDTH, 180);
	const glaserHead = h2('6', 'Interstitial condensation (Glaser method, ISO 13788:2012)');
	const glaser = condensationPart(el, r);
	if (vchart && r.condensation) {
		out.push({
			stack: [
				glaserHead,
				...chart(
					vchart,
					`Vapour pressure against the cumulative sd-value in ${monthName(r.condensation.vapourProfile.month)}, the month shown being the one with the most condensation formed (or the coldest): saturation pressure solid, actual vapour pressure dashed; where the two lines meet, vapour condenses (circles).`
				)
			],
			unbreakable: true
		} as Content);
		out.push(...glaser);
	} else {
		out.push(keep(glaserHead, glaser[0]));
		out.push(...glaser.slice(1));
	}
	out.push(keep(h2('7', 'Surface humidity (fRsi)'), surfacePart(r)));
	out.push(keep(h2('8', 'Assumptions and notes'), assumptions(el, r)));
	// An element report states the validity once, beside its declaration.
	const alone = s.document.scope === 'element';
	out.push(keep(h2('9', alone ? 'Cautions' : 'Validity and cautions'), cautionsBlock(!alone)));
	if (alone) out.push(declarationBlock(s, '10'));
	return out;
}

/** Names in a sentence: "A", "A and B", "A, B and C". */
function names(list: string[]): string {
	return list.length > 1 ? `${list.slice(0, -1).join(', ')} and ${list[list.length - 1]}` : (list[0] ?? '');
}

/** "1 element", "2 elements". */
function elementsCount(n: number): string {
	return `${n} element${n === 1 ? '' : 's'}`;
}

/**
 * The moisture line of the dwelling summary: what the checks found, each finding in its own colour
 * (fail when condensate accumulates or a surface check fails, caution when condensate forms and dries
 * out within the year, pass when nothing forms).
 */
export function moistureSummary(s: ReportSnapshot): Content {
	const withC = s.elements.filter((e) => e.result?.condensation);
	const accumulating = withC.filter((e) => e.result!.condensation!.outcome === 'accumulates');
	const drying = withC.filter((e) => e.result!.condensation!.outcome === 'dries');
	const withS = s.elements.filter((e) => e.result?.surface);
	const mould = withS.filter((e) => !e.result!.surface!.pass);
	// Why a check did not run comes from the result: a floor on the ground is never assessed for
	// interstitial condensation, whatever climate it has; any other element lacks a climate.
	const onGround = s.elements.filter((e) => e.result && !e.result.condensation && e.result.ground);
	const unchecked = s.elements.filter(
		(e) => e.result && !e.result.condensation && !e.result.surface && !e.result.ground
	);
	const groundNames = names(onGround.map((e) => e.name));
	const parts: Content[] = [];
	const add = (text: string, color: string) => parts.push({ text, color } as Content);
	if (withC.length === 0) {
		const why: string[] = [];
		if (unchecked.length || !onGround.length) why.push('no climate attached');
		if (onGround.length) why.push(`not assessed for a floor in contact with the ground: ${groundNames}`);
		add(`no interstitial condensation check was run (${why.join('; ')}). `, SOFT);
	} else {
		if (accumulating.length)
			add(
				`${elementsCount(accumulating.length)} accumulate${accumulating.length === 1 ? 's' : ''} interstitial condensate over the year (${names(accumulating.map((e) => e.name))}). `,
				FAIL
			);
		if (drying.length)
			add(
				`${elementsCount(drying.length)} condense${drying.length === 1 ? 's' : ''} in the colder months and dr${drying.length === 1 ? 'ies' : 'y'} out within the year (${names(drying.map((e) => e.name))})${accumulating.length ? '' : '; none accumulates'}. `,
				CAUTION
			);
		if (!accumulating.length && !drying.length)
			add(
				`no interstitial condensation forms in any element${onGround.length ? ' assessed for it' : ''} in any month. `,
				PASS
			);
	}
	if (withS.length) {
		if (mould.length)
			add(
				`The surface-humidity check (mould risk) fails for ${names(mould.map((e) => e.name))}: fRsi ≤ fRsi,min. `,
				FAIL
			);
		else add('Every surface-humidity check run passes (fRsi > fRsi,min: no surface mould risk). ', PASS);
	}
	if (unchecked.length && withC.length)
		add(`Not checked for moisture (no climate): ${names(unchecked.map((e) => e.name))}. `, SOFT);
	if (onGround.length && withC.length)
		add(
			`Interstitial condensation is not assessed for a floor in contact with the ground (${groundNames}). `,
			SOFT
		);
	const surfaceUnchecked = new Map<string, string[]>();
	for (const e of onGround) {
		const why = surfaceNotAssessed(e.result!);
		if (why) surfaceUnchecked.set(why.short, [...(surfaceUnchecked.get(why.short) ?? []), e.name]);
	}
	for (const [why, list] of surfaceUnchecked) add(`Surface-humidity check ${why} (${names(list)}). `, SOFT);
	if (accumulating.length || drying.length || mould.length) add('See the element pages.', INK);
	return {
		text: [{ text: 'Moisture: ', bold: true }, ...parts],
		fontSize: 8.5,
		margin: [0, 0, 0, 4]
	} as Content;
}

/** The summary of a dwelling report: every element, ΣU·A and the area-weighted mean U. */
export function dwellingSummary(s: ReportSnapshot): Content[] {
	const out: Content[] = [h1(`Dwelling ${s.dwelling.reference}`, 'Dwelling report')];
	out.push(identity(s, null));
	out.push(h2('1', 'Elements'));
	const body: TableCell[][] = [
		[
			th('#'),
			th('Element'),
			th('Kind'),
			th('Area m²', true),
			th('U W/(m²·K)', true),
			th('Limit', true),
			th('U·A W/K', true),
			th('Result'),
			th('Moisture')
		]
	];
	let area = 0;
	let ua = 0;
	s.elements.forEach((el, i) => {
		const uExact = el.result ? el.result.uValue : (el.givenU ?? null);
		if (uExact !== null) {
			area += el.area;
			ua += uExact * el.area;
		}
		body.push([
			String(i + 1),
			el.name,
			{ text: ELEMENT_KIND_LABELS[el.kind] ?? el.kind, fontSize: 7.5 } as TableCell,
			num(fx(el.area, 2)),
			num(fx(el.u, 2)),
			num(el.limit === null ? '—' : fx(el.limit, 2)),
			num(uExact === null ? '—' : fx(uExact * el.area, 2)),
			{
				text: passWord(el.pass),
				bold: el.pass !== null,
				color: el.pass === null ? SOFT : el.pass ? PASS : FAIL
			} as TableCell,
			{ text: moistureWord(el), fontSize: 7.5 } as TableCell
		]);
	});
	body.push([
		'',
		{ text: 'Total', bold: true } as TableCell,
		'',
		{ text: fx(area, 2), alignment: 'right', bold: true } as TableCell,
		'',
		'',
		{ text: fx(ua, 2), alignment: 'right', bold: true } as TableCell,
		'',
		''
	]);
	out.push({
		table: { headerRows: 1, dontBreakRows: true, widths: [12, '*', 80, 40, 46, 32, 44, 40, 88], body },
		layout: rules,
		fontSize: 8
	} as Content);
	const failing = s.elements.filter((e) => e.pass === false).length;
	out.push({
		table: {
			widths: ['*', '*', '*'],
			body: [
				[
					{
						stack: [
							{ text: 'ΣU·A', fontSize: 7.5, color: SOFT },
							{ text: `${fx(ua, 2)} W/K`, fontSize: 14, bold: true }
						]
					},
					{
						stack: [
							{ text: 'Area-weighted mean U = ΣU·A / ΣA', fontSize: 7.5, color: SOFT },
							{ text: area > 0 ? `${fx(ua / area, 3)} W/(m²·K)` : '—', fontSize: 14, bold: true }
						]
					},
					{
						stack: [
							{ text: 'U-values against their limits', fontSize: 7.5, color: SOFT },
							{
								text: failing ? `${failing} exceed${failing === 1 ? 's' : ''}` : 'All meet or have no limit',
								fontSize: 14,
								bold: true,
								color: failing ? FAIL : PASS
							}
						]
					}
				]
			] as TableCell[][]
		},
		layout: panel,
		margin: [0, 8, 0, 4]
	} as Content);
	out.push(moistureSummary(s));
	out.push({
		text: `ΣU·A and the mean use the unrounded U-values over the areas given (ΣA = ${fx(area, 2)} m²); the table shows U to the reporting precision. Limits: ${s.limitTable ? `${s.limitTable.name}, ${s.limitTable.edition}` : 'no limit table applies'}. Each element follows on its own pages with its layers, method, charts and moisture checks.`,
		fontSize: 7.8,
		color: SOFT,
		margin: [0, 0, 0, 4]
	} as Content);
	// Snapshots frozen before junctions were reported have none and print as they were issued.
	if (s.junctions) {
		out.push(...junctionsSummary(s.junctions, ua));
		out.push(keep(h2('3', 'Cautions'), cautionsBlock(false)));
	} else out.push(keep(h2('2', 'Cautions'), cautionsBlock(false)));
	return out;
}

/* ---------------------------------------------------------------- the client's summary */

/** A finding as a paragraph: its tone's word in its colour, then the text. */
function finding(f: Finding, margin: [number, number, number, number] = [0, 0, 0, 4]): Content {
	const lead = TONE_WORDS[f.tone];
	return {
		text: [
			...(lead ? [{ text: `${lead}: `, bold: true, color: TONE_COLOURS[f.tone] }] : []),
			...(f.label ? [{ text: `${f.label}. `, bold: true }] : []),
			{ text: f.text }
		],
		margin
	} as Content;
}

/** An unnumbered heading of the client's pages, kept with what follows it. */
function plainHeading(text: string): Content {
	return { text, style: 'h2', headlineLevel: 2 } as Content;
}

/**
 * The first page(s) of a dwelling report: the summary for the client in plain words (client-summary.ts,
 * the same words as the e-mail), kept apart from the technical pages that follow it.
 */
export function clientSummaryPages(s: ReportSnapshot): Content[] {
	const c = clientSummary(s);
	const out: Content[] = [h1(c.title, c.kicker)];
	out.push({
		table: {
			widths: ['*'],
			body: [
				[
					{
						text: [
							{ text: 'In short: ', bold: true, color: TONE_COLOURS[c.headline.tone] },
							{ text: c.headline.text, bold: true, color: TONE_COLOURS[c.headline.tone] }
						],
						fontSize: 11
					}
				]
			] as TableCell[][]
		},
		layout: panel,
		margin: [0, 0, 0, 8]
	} as Content);
	out.push({
		stack: [
			...(c.preparedFor ? [{ text: c.preparedFor, bold: true, margin: [0, 0, 0, 4] }] : []),
			...c.intro.map((p) => ({ text: p, margin: [0, 0, 0, 4] }))
		]
	} as Content);
	out.push(
		keep(plainHeading(c.assessed.heading), {
			stack: c.assessed.paragraphs.map((p) => ({ text: p, margin: [0, 0, 0, 4] }))
		} as Content)
	);
	out.push(
		keep(plainHeading(c.heatLoss.heading), { stack: c.heatLoss.paragraphs.map((p) => finding(p)) } as Content)
	);
	const t = c.table;
	const body: TableCell[][] = [
		[
			th(t.columns.name),
			th(t.columns.kind),
			th(`${t.columns.u}\n${t.columns.unit}`, true),
			th(`${t.columns.limit}\n${t.columns.unit}`, true),
			th(t.columns.verdict),
			th(t.columns.moisture)
		],
		...t.rows.map(
			(r) =>
				[
					{ text: r.name, bold: true },
					r.kind,
					num(r.u),
					num(r.limit),
					{
						text: r.verdict.text,
						bold: r.verdict.tone !== 'none',
						color: r.verdict.tone === 'none' ? SOFT : TONE_COLOURS[r.verdict.tone]
					},
					{ text: r.moisture.text, color: r.moisture.tone === 'none' ? SOFT : TONE_COLOURS[r.moisture.tone] }
				] as TableCell[]
		)
	];
	out.push({
		table: { headerRows: 1, dontBreakRows: true, widths: ['*', 86, 62, 44, 66, 132], body },
		layout: rules,
		fontSize: 8.4,
		margin: [0, 2, 0, 4]
	} as Content);
	out.push(
		keep(plainHeading(c.moisture.heading), { stack: c.moisture.paragraphs.map((p) => finding(p)) } as Content)
	);
	out.push(
		keep(plainHeading(c.nextSteps.heading), {
			ul: c.nextSteps.items.map((f) => finding(f, [0, 0, 0, 2]))
		} as Content)
	);
	// The cautions may run on to the next page (a heading never ends a page: pageBreakBefore).
	out.push(plainHeading(c.cautions.heading));
	out.push({ ul: c.cautions.items.map((x) => ({ text: x, margin: [0, 0, 0, 2] })) } as Content);
	out.push({ text: c.closing, color: SOFT, margin: [0, 6, 0, 0] } as Content);
	return [{ stack: out, fontSize: 9.3, lineHeight: 1.18 } as Content];
}

/** The complete pdfmake document for a snapshot (element or dwelling scope). */
const EVIDENCE_TYPE_LABELS: Record<string, string> = {
	'image/jpeg': 'JPEG photo',
	'image/png': 'PNG image',
	'application/pdf': 'PDF document'
};

/** A file's size for people: 1.2 MB, 340 kB, 900 bytes. */
function fileSize(bytes: number): string {
	if (bytes >= 1e6) return `${trim(bytes / 1e6, 1)} MB`;
	if (bytes >= 1e3) return `${Math.round(bytes / 1e3)} kB`;
	return `${bytes} bytes`;
}

/**
 * The evidence kept with the dwelling when the report was issued: each file with what it shows, its kind
 * and size, when it was uploaded and its SHA-256, by which a copy can be matched to this report. Nothing
 * when the snapshot lists none (or was frozen before evidence was listed).
 */
export function evidenceBlock(s: ReportSnapshot, head: Content): Content[] {
	const files = s.evidence ?? [];
	if (!files.length) return [];
	const forWhat = (e: (typeof files)[number]) =>
		e.elementName === null
			? 'The dwelling'
			: e.layerIndex === null
				? e.elementName
				: `${e.elementName}, layer ${e.layerIndex + 1}${e.layerName ? `: ${e.layerName}` : ''}`;
	// The heading stays with the first lines; a long list breaks across pages, its header repeated.
	return [
		keep(head, {
			text: `${files.length === 1 ? 'One file was' : `${files.length} files were`} kept with the dwelling when this report was issued, and stay as they were. A copy matches when its SHA-256 is the one printed here.`,
			color: SOFT,
			margin: [0, 0, 0, 4]
		} as Content),
		{
			table: {
				headerRows: 1,
				dontBreakRows: true,
				widths: ['*', 120, 70, 60],
				body: [
					[th('File and SHA-256'), th('Shows'), th('Kind, size'), th('Uploaded')],
					...files.map((e) => [
						{
							stack: [
								{ text: e.name, bold: true },
								{ text: e.sha256, fontSize: 6.5, color: SOFT, characterSpacing: 0.2 }
							]
						},
						{ text: forWhat(e) },
						{ text: `${EVIDENCE_TYPE_LABELS[e.contentType] ?? e.contentType}, ${fileSize(e.bytes)}` },
						{ text: longDate(e.uploadedAt) }
					])
				] as TableCell[][]
			},
			layout: rules
		} as Content
	];
}

export function reportDocument(s: ReportSnapshot): TDocumentDefinitions {
	const d = s.document;
	const content: Content[] = [];
	if (d.scope === 'dwelling') {
		// The client's summary in plain words comes first, on its own page(s), before the technical pages.
		content.push(...clientSummaryPages(s));
		content.push({ canvas: [], pageBreak: 'after' } as Content);
		content.push(...dwellingSummary(s));
		s.elements.forEach((el, i) => {
			content.push({ text: '', pageBreak: 'after' } as Content);
			content.push(...elementSection(s, el, { index: i, of: s.elements.length }));
		});
		// A break of no height: a junction page filled to its foot leaves no empty page after it. Snapshots
		// frozen before junctions were reported keep the breaks they were issued with.
		const pageBreak = (): Content =>
			(s.junctions ? { canvas: [], pageBreak: 'after' } : { text: '', pageBreak: 'after' }) as Content;
		const calculated = reportedJunctions(s.junctions);
		if (calculated.length) {
			content.push(pageBreak());
			content.push(...junctionsMethodPage(s, calculated));
		}
		calculated.forEach((j, i) => {
			content.push(pageBreak());
			content.push(...junctionSection(s, j, { index: i, of: calculated.length }));
		});
		if (s.evidence?.length) {
			content.push(pageBreak());
			content.push(...evidenceBlock(s, h1('Evidence', `Dwelling ${s.dwelling.reference}`)));
		}
		// The declaration closes the dwelling report, on a page of its own.
		content.push(pageBreak());
		content.push(h1('Declaration', `Dwelling ${s.dwelling.reference}`));
		content.push(declarationBlock(s, null));
	} else {
		content.push(...elementSection(s, s.elements[0], null));
		content.push(...evidenceBlock(s, h2('Annex', 'Evidence kept with the dwelling')));
	}
	const numberLine = d.draft ? 'DRAFT — not issued' : `Report ${d.number} · revision ${d.revision}`;
	const title =
		d.scope === 'dwelling'
			? `Dwelling report ${s.dwelling.reference}`
			: `Element report ${s.elements[0]?.name ?? ''} — ${s.dwelling.reference}`;
	return {
		pageSize: 'A4',
		pageMargins: PAGE_MARGINS,
		info: {
			title,
			author: s.dwelling.assessor?.name ?? s.organisation.name,
			subject: d.draft ? 'Draft' : `${d.number} revision ${d.revision}`,
			creator: 'Envelo',
			producer: 'Envelo',
			creationDate: new Date(s.issuedAt)
		},
		...(d.draft
			? { watermark: { text: 'DRAFT', color: '#b3261e', opacity: 0.07, bold: true, fontSize: 120 } }
			: {}),
		header: () =>
			({
				margin: [PAGE_MARGINS[0], 26, PAGE_MARGINS[2], 0],
				stack: [
					{
						columns: [
							{
								text: [
									{ text: 'Envelo', bold: true, color: CHART_COLOURS.heat },
									{ text: `  ${s.organisation.name}`, color: SOFT }
								],
								fontSize: 8
							},
							{
								text: [
									{ text: numberLine, bold: true },
									{ text: `  ·  Dwelling ${s.dwelling.reference}`, color: SOFT }
								],
								alignment: 'right',
								fontSize: 8
							}
						]
					},
					{
						canvas: [
							{ type: 'line', x1: 0, y1: 5, x2: CONTENT_WIDTH, y2: 5, lineWidth: 0.5, lineColor: LINE }
						]
					}
				]
			}) as Content,
		footer: (currentPage: number, pageCount: number) =>
			({
				margin: [PAGE_MARGINS[0], 14, PAGE_MARGINS[2], 0],
				stack: [
					{
						canvas: [
							{ type: 'line', x1: 0, y1: 0, x2: CONTENT_WIDTH, y2: 0, lineWidth: 0.5, lineColor: LINE }
						]
					},
					{
						margin: [0, 5, 0, 0],
						columns: [
							d.draft || !d.verificationCode
								? {
										text: 'Draft: not issued and not verifiable. Issue the report to give it a number and a verification code.',
										fontSize: 7,
										color: FAIL,
										width: '*'
									}
								: {
										text: [
											{ text: 'Verify this report: ', color: SOFT },
											{ text: d.verifyUrl ?? '', link: d.verifyUrl ?? undefined, color: INK },
											{ text: '   code ', color: SOFT },
											{ text: groupCode(d.verificationCode), bold: true }
										],
										fontSize: 7,
										width: '*'
									},
							{
								text: `${d.draft ? 'Draft' : d.number} · Dwelling ${s.dwelling.reference} · Page ${currentPage} of ${pageCount}`,
								alignment: 'right',
								fontSize: 7,
								color: SOFT,
								width: 'auto'
							}
						]
					}
				]
			}) as Content,
		content,
		// A heading never ends a page: each is kept with the block after it (unbreakable stacks), and one
		// that nothing follows on its page moves to the next.
		pageBreakBefore: (node, { getFollowingNodesOnPage }) =>
			(node.headlineLevel === 1 || node.headlineLevel === 2) && getFollowingNodesOnPage().length === 0,
		defaultStyle: { font: FONT, fontSize: 8.8, color: INK, lineHeight: 1.15 },
		styles: {
			kicker: { fontSize: 7.5, color: CHART_COLOURS.heat, bold: true, characterSpacing: 0.6 },
			h1: { fontSize: 17, bold: true, margin: [0, 1, 0, 8] },
			h2: { fontSize: 10.5, bold: true, margin: [0, 12, 0, 4] },
			h3: { fontSize: 9.8, bold: true, margin: [0, 7, 0, 2.5] }
		}
	};
}

/* ---------------------------------------------------------------- junctions */

/** The junctions that have a page: calculated ones with a result. */
export function reportedJunctions(list: readonly SnapshotJunction[] | undefined): SnapshotJunction[] {
	return (list ?? []).filter((j) => j.source === 'calculated' && j.result !== null);
}

/** Where a junction's ψ comes from, as the summary prints it. */
function psiFrom(j: SnapshotJunction): TableCell {
	if (j.source === 'entered')
		return {
			stack: [
				{ text: 'entered, not calculated here', bold: true, color: CAUTION },
				{ text: `source: ${j.psiSource?.trim() || 'not recorded'}`, fontSize: 7, color: SOFT }
			]
		} as TableCell;
	if (!j.result) return { text: 'could not be calculated', color: FAIL } as TableCell;
	return { text: `calculated here, ${DIMENSION_SYSTEM_LABELS[j.dimensionSystem]}` } as TableCell;
}

/** The fRsi of a calculated junction against the climate's month (else the figure for dwellings), short. */
function junctionSurfaceWord(r: JunctionCalculation): { text: string; color: string } {
	const sf = r.surface;
	if (sf.critical)
		return sf.critical.pass
			? { text: `fRsi ${fx(sf.fRsi, 3)} ≥ ${fx(sf.critical.fRsiMin, 3)}`, color: PASS }
			: { text: `fRsi ${fx(sf.fRsi, 3)} < ${fx(sf.critical.fRsiMin, 3)}`, color: FAIL };
	return sf.ruleOfThumb.pass
		? { text: `fRsi ${fx(sf.fRsi, 3)} ≥ ${fx(sf.ruleOfThumb.value, 2)}`, color: PASS }
		: { text: `fRsi ${fx(sf.fRsi, 3)} < ${fx(sf.ruleOfThumb.value, 2)}`, color: CAUTION };
}

/**
 * The dwelling summary's junctions: each with its length, ψ and ψ·L and where its ψ comes from (an
 * entered one with its source, marked as not calculated here), then the transmission heat-loss
 * coefficient H_T = ΣU·A + Σψ·L (ISO 13789; point thermal bridges left out).
 */
function junctionsSummary(junctions: readonly SnapshotJunction[], ua: number): Content[] {
	const out: Content[] = [];
	let sumPsiL = 0;
	const without: string[] = [];
	const systems = new Set<string>();
	const body: TableCell[][] = [
		[
			th('#'),
			th('Junction'),
			th('Type'),
			th('Length m', true),
			th('ψ W/(m·K)', true),
			th('ψ·L W/K', true),
			th('ψ from'),
			th('Surface')
		]
	];
	junctions.forEach((j, i) => {
		if (j.psi === null || !Number.isFinite(j.psi)) without.push(j.name);
		else {
			sumPsiL += j.psi * j.lengthM;
			systems.add(j.dimensionSystem);
		}
		const surface = j.result ? junctionSurfaceWord(j.result) : { text: '—', color: SOFT };
		body.push([
			String(i + 1),
			j.name,
			{ text: JUNCTION_TYPE_LABELS[j.type] ?? j.type, fontSize: 7.5 } as TableCell,
			num(fx(j.lengthM, 2)),
			num(fx(j.psi, 3)),
			num(j.psi === null ? '—' : fx(j.psi * j.lengthM, 2)),
			{ ...(psiFrom(j) as object), fontSize: 7.5 } as TableCell,
			{ text: surface.text, color: surface.color, fontSize: 7.5 } as TableCell
		]);
	});
	if (junctions.length)
		body.push([
			'',
			{ text: 'Total', bold: true } as TableCell,
			'',
			'',
			'',
			{ text: fx(sumPsiL, 2), alignment: 'right', bold: true } as TableCell,
			'',
			''
		]);
	const table: Content = junctions.length
		? ({
				table: { headerRows: 1, dontBreakRows: true, widths: [12, '*', 86, 38, 40, 38, 98, 66], body },
				layout: rules,
				fontSize: 8
			} as Content)
		: ({
				text: 'No junctions (linear thermal bridges) are recorded for this dwelling: Σψ·L is 0 and the transmission heat-loss coefficient is ΣU·A alone, which leaves out the extra heat loss where elements meet.',
				color: SOFT
			} as Content);
	out.push(keep(h2('2', 'Junctions and transmission heat loss'), table));
	const cell = (label: string | Content[], value: string) => ({
		stack: [
			{ text: label, fontSize: 7.5, color: SOFT },
			{ text: value, fontSize: 14, bold: true }
		]
	});
	out.push({
		table: {
			widths: ['*', '*', '*'],
			body: [
				[
					cell('ΣU·A (elements)', `${fx(ua, 2)} W/K`),
					cell('Σψ·L (junctions)', `${fx(sumPsiL, 2)} W/K`),
					cell([{ text: 'H' }, { text: 'T', sub: true }, ' = ΣU·A + Σψ·L'], `${fx(ua + sumPsiL, 2)} W/K`)
				]
			] as TableCell[][]
		},
		layout: panel,
		margin: [0, 8, 0, 4]
	} as Content);
	const remarks: Content[] = [];
	const add = (text: string, color = SOFT) => remarks.push({ text, color } as Content);
	const below = junctions.filter((j) => j.result?.surface.critical && !j.result.surface.critical.pass);
	if (below.length)
		add(
			`The surface temperature factor is below the month’s fRsi,min at ${names(below.map((j) => j.name))}: risk of mould growth at the junction. `,
			FAIL
		);
	if (without.length) add(`Left out of Σψ·L for want of a ψ: ${names(without)}. `, CAUTION);
	if (systems.size > 1)
		add(
			`The ψ-values refer to different dimension systems (${[...systems].map((x) => DIMENSION_SYSTEM_LABELS[x as keyof typeof DIMENSION_SYSTEM_LABELS]).join(', ')}): each holds only with areas and lengths measured the same way, so this sum mixes conventions. `,
			CAUTION
		);
	if (junctions.some((j) => j.source === 'entered'))
		add(
			'An entered ψ is taken from the source named beside it; Envelo did not calculate it and it rests on that source. '
		);
	add(
		`The transmission heat-loss coefficient (ISO 13789) leaves out point thermal bridges. ψ-values refer to the dimension system named, and the lengths are the assessor's, measured the same way.${reportedJunctions(junctions).length ? ' Each calculated junction follows on a page of its own after the elements, with its model, picture, figures, mesh and cautions; the method and cautions that hold for every junction calculation are set out once, before them.' : ''}`
	);
	out.push({ text: remarks, fontSize: 7.8, margin: [0, 0, 0, 4] } as Content);
	return out;
}

/** What every junction calculation is subject to, said once before the junction pages. */
const COMMON_CAUTIONS = new Set(COMMON_JUNCTION_CAUTIONS);
const COMMON_METHOD = new Set(COMMON_JUNCTION_METHOD);

/**
 * The page before the junction pages: the method and the cautions that every junction calculation of
 * the report shares, in full (each junction page says what is its own).
 */
export function junctionsMethodPage(s: ReportSnapshot, calculated: readonly SnapshotJunction[]): Content[] {
	const method = COMMON_JUNCTION_METHOD.filter((m) => calculated.some((j) => j.result!.method.includes(m)));
	const cautions = COMMON_JUNCTION_CAUTIONS.filter((c) =>
		calculated.some((j) => j.result!.cautions.includes(c))
	);
	return [
		h1('Junctions: method and cautions', `Dwelling ${s.dwelling.reference}`),
		{
			text: `${calculated.length === 1 ? 'The junction on the next page was' : `The ${calculated.length} junctions on the next pages were`} calculated as two-dimensional models of ISO 10211, each twice: once with the surface resistances of ISO 6946 for L2D and ψ, once with Rsi = 0.25 m²·K/W on the inside surfaces for the temperature factor fRsi (ISO 13788). What follows holds for every one of them; each page adds its solver, its mesh and convergence, its notes and any caution of its own.`,
			margin: [0, 0, 0, 4]
		} as Content,
		keep(h2('1', 'Method'), { ul: method, fontSize: 8.2 } as Content),
		keep(h2('2', 'Cautions'), { ul: cautions, fontSize: 8.2, color: SOFT } as Content)
	];
}

/**
 * A junction page's cautions: the result's own (a mesh that did not converge, a model the engine warns
 * of), then the common ones in short, pointing to the summary that lists them in full.
 */
function ownCautions(r: JunctionCalculation): string[] {
	const own = r.cautions.filter((c) => !COMMON_CAUTIONS.has(c));
	const shared = r.cautions.length - own.length;
	return [
		...own,
		...(shared
			? [
					'Cautions: steady-state results for the model as described; they support, and do not replace, professional judgement, and local codes and licensed practice decide. The method and cautions of every junction calculation are set out in full before the first junction.'
				]
			: [])
	];
}

/** " every 2 K" when the picture has two isotherms or more. */
function isothermStep(t: { levels: number[] } | null): string {
	return t && t.levels.length > 1 ? ` every ${trim(t.levels[1] - t.levels[0], 3)} K` : '';
}

/** The picture window: the sampled field's extent, else the builder's view with a margin, else the material's. */
function pictureWindow(j: SnapshotJunction): ModelBox {
	const f = j.field;
	if (f && f.xs.length > 1 && f.ys.length > 1)
		return { x0: f.xs[0], x1: f.xs[f.xs.length - 1], y0: f.ys[0], y1: f.ys[f.ys.length - 1] };
	const v = j.result?.view;
	if (v) {
		const m = 0.06 * Math.max(v.x1 - v.x0, v.y1 - v.y0);
		return { x0: v.x0 - m, y0: v.y0 - m, x1: v.x1 + m, y1: v.y1 + m };
	}
	const rs = j.model?.regions ?? [];
	return {
		x0: Math.min(...rs.map((r) => r.x0)),
		y0: Math.min(...rs.map((r) => r.y0)),
		x1: Math.max(...rs.map((r) => r.x1)),
		y1: Math.max(...rs.map((r) => r.y1))
	};
}

/** The headline figures of a junction: ψ, L2D, fRsi against the month, and against the figure for dwellings. */
function junctionPanel(j: SnapshotJunction, r: JunctionCalculation): Content {
	const big = (label: string, value: string, sub: Content) =>
		({
			stack: [
				{ text: label, fontSize: 7.5, color: SOFT },
				{ text: value, fontSize: 15, bold: true, margin: [0, 1, 0, 1] },
				sub
			]
		}) as Content;
	const sf = r.surface;
	const cells: Content[] = [
		big('ψ, W/(m·K)', fx(r.psi, 3), {
			text: `on ${DIMENSION_SYSTEM_LABELS[r.dimensionSystem]}`,
			fontSize: 7.5,
			color: SOFT
		} as Content),
		big('ψ·L, W/K', r.psi === null ? '—' : fx(r.psi * j.lengthM, 2), {
			text: `over ${fx(j.lengthM, 2)} m in the dwelling`,
			fontSize: 7.5,
			color: SOFT
		} as Content),
		big('Temperature factor fRsi', fx(sf.fRsi, 3), {
			text: sf.critical
				? [
						verdict(sf.critical.pass, 'Meets', 'Below the limit'),
						{
							text: ` · fRsi,min ${fx(sf.critical.fRsiMin, 3)} (${monthName(sf.critical.month)})`,
							color: SOFT
						}
					]
				: { text: 'no climate: no monthly fRsi,min', color: SOFT },
			fontSize: 7.5
		} as Content),
		big(
			`Against ${fx(sf.ruleOfThumb.value, 2)} for dwellings`,
			sf.ruleOfThumb.pass ? 'At or above' : 'Below',
			{
				text: sf.ruleOfThumb.source,
				fontSize: 7.5,
				color: SOFT
			} as Content
		)
	];
	return {
		table: { widths: ['*', '*', '*', '*'], body: [cells as TableCell[]] },
		layout: panel,
		margin: [0, 6, 0, 4]
	} as Content;
}

/** ψ in every dimension system the flanks are known in, L2D and the flanks subtracted, as a paragraph. */
function psiFigures(r: JunctionCalculation): Content {
	const systems = DIMENSION_SYSTEMS.filter((d) => r.psiBySystem[d] !== undefined).map((d) =>
		d === r.dimensionSystem
			? { text: `${DIMENSION_SYSTEM_LABELS[d]} ${fx(r.psiBySystem[d], 3)} (used)`, bold: true }
			: { text: `${DIMENSION_SYSTEM_LABELS[d]} ${fx(r.psiBySystem[d], 3)}` }
	);
	const flanks = r.flanks.map(
		(f, i) => `${f.name ?? `flank ${i + 1}`} U ${fx(f.uValue, 4)} W/(m²·K) × ${fx(f.lengthMm / 1000, 3)} m`
	);
	return {
		text: [
			{ text: 'ψ = L2D − Σ U·l', bold: true },
			', W/(m·K), on ',
			...systems.flatMap((x, i) => (i ? [i === systems.length - 1 ? ' and ' : ', ', x] : [x])),
			`. L2D ${fx(r.couplingCoefficient, 4)} W/(m·K); flanks subtracted: ${flanks.length ? names(flanks) : 'none, so ψ is not defined'}.`
		]
	} as Content;
}

/** fRsi, the coldest point, and the verdicts against the month's fRsi,min and the figure for dwellings, as a paragraph. */
function surfaceFigures(r: JunctionCalculation): Content {
	const sf = r.surface;
	const parts: Content[] = [
		{ text: 'fRsi', bold: true } as Content,
		` ${fx(sf.fRsi, 3)} with Rsi ${trim(sf.rsi, 3)} m²·K/W on ${names(sf.checked)}; the coldest inside point ${fx(sf.coldest.temperature, 1)} °C at θi ${fx(sf.temperatures.inside, 1)} °C and θe ${fx(sf.temperatures.outside, 1)} °C. `
	];
	if (sf.critical)
		parts.push(
			`fRsi,min ${fx(sf.critical.fRsiMin, 3)} in ${monthName(sf.critical.month)}, the critical month of the dwelling’s climate (80 % surface humidity, ISO 13788:2012 clause 5): `,
			sf.critical.pass
				? ({ text: 'meets the limit, fRsi ≥ fRsi,min', bold: true, color: PASS } as Content)
				: ({
						text: 'below the limit, fRsi < fRsi,min: risk of mould growth at the junction',
						bold: true,
						color: FAIL
					} as Content),
			'. '
		);
	else parts.push({ text: 'No monthly fRsi,min: the dwelling has no climate. ', color: CAUTION } as Content);
	parts.push(
		`Against ${fx(sf.ruleOfThumb.value, 2)} for dwellings (${sf.ruleOfThumb.source}): `,
		{
			text: sf.ruleOfThumb.pass ? 'at or above' : 'below',
			bold: true,
			color: sf.ruleOfThumb.pass ? PASS : CAUTION
		} as Content,
		'.'
	);
	if (!sf.converged) parts.push(' The surface run did not meet the mesh criterion: fRsi is approximate.');
	return { text: parts } as Content;
}

/**
 * The junction's own method sentences (its solver, the mesh's last change against the criterion, the
 * dimension system) and its notes (cut-off planes, the meshes and the solver's figures), then its cautions.
 */
function junctionMethod(r: JunctionCalculation): Content[] {
	return [
		{
			ul: [...r.method.filter((m) => !COMMON_METHOD.has(m)), ...r.notes],
			fontSize: 6.7,
			lineHeight: 1.06,
			margin: [0, 0, 0, 2.5]
		},
		{ ul: ownCautions(r), fontSize: 6.7, lineHeight: 1.06, color: SOFT }
	] as Content[];
}

/**
 * One calculated junction of the dwelling, on a page of its own: the model in words, its pictures
 * (materials; temperatures with isotherms and the coldest point), ψ with its dimension system, fRsi
 * against the month's limit and the figure for dwellings, the method with the mesh and its
 * convergence, and the notes and cautions of the result.
 */
export function junctionSection(
	s: ReportSnapshot,
	j: SnapshotJunction,
	position: { index: number; of: number }
): Content[] {
	const r = j.result!;
	const out: Content[] = [
		h1(j.name, `Junction ${position.index + 1} of ${position.of} · ${JUNCTION_TYPE_LABELS[j.type] ?? j.type}`)
	];
	out.push(junctionPanel(j, r));
	const words = describeJunctionModel(j, s.elements);
	out.push(
		keep(h3('1', 'Model'), {
			stack: words.map((w) => ({ text: w, margin: [0, 0, 0, 1.5] })),
			fontSize: 7.6
		} as Content)
	);
	if (j.model) {
		const gap = 12;
		const width = (CONTENT_WIDTH - gap) / 2;
		const frame = junctionFrame(pictureWindow(j), width, 116);
		const temperatures = junctionTemperaturePicture(
			j.model,
			j.field,
			frame,
			r.surface.coldest,
			r.surface.fRsi
		);
		const picture = (svg: string) =>
			({ svg, width, font: FONT, height: frame.h + JUNCTION_LEGEND_HEIGHT }) as unknown as Content;
		out.push({
			stack: [
				h3('2', 'Cross-section and temperatures'),
				{
					columns: [
						picture(junctionMaterialsPicture(j.model, frame)),
						temperatures ? picture(temperatures.svg) : { text: 'No temperature field was kept.', color: SOFT }
					],
					columnGap: gap,
					margin: [0, 2, 0, 0]
				},
				{
					text: `To scale, ${fx((frame.window.x1 - frame.window.x0) / 1000, 2)} × ${fx((frame.window.y1 - frame.window.y0) / 1000, 2)} m around the junction (the model runs on to its cut-off planes). Left: materials, darker where λ is higher. Right: temperatures of the surface-check run (Rsi ${trim(r.surface.rsi, 3)} m²·K/W inside) at θi ${fx(r.surface.temperatures.inside, 1)} °C and θe ${fx(r.surface.temperatures.outside, 1)} °C, banded between isotherms${isothermStep(temperatures)}; the ring marks the coldest inside point.`,
					fontSize: 7.2,
					color: SOFT,
					margin: [0, 3, 0, 2]
				}
			],
			unbreakable: true
		} as Content);
	}
	out.push(
		keep(h3('3', 'ψ and the surface temperature factor'), {
			columns: [
				{ width: '*', stack: [psiFigures(r)] },
				{ width: '*', stack: [surfaceFigures(r)] }
			],
			columnGap: 14,
			fontSize: 7.6
		} as Content)
	);
	const [head, ...rest] = junctionMethod(r);
	out.push(keep(h3('4', 'Method, mesh, convergence and cautions'), head), ...rest);
	return out;
}
