/**
 * pdfmake document definitions of Envelo's reports: an element report, and a dwelling report made of
 * a summary and one element report per element. Built from a frozen snapshot only: no clock, no
 * database, so the same snapshot gives the same document.
 */
import type { Content, TDocumentDefinitions, CustomTableLayout, TableCell } from 'pdfmake/interfaces';
import { CAUTIONS, type ElementResult, type LayerResult } from '$lib/physics';
import { ELEMENT_KIND_LABELS } from '$lib/dwellings/kinds';
import type { StoredLayer } from '$lib/dwellings/element-input';
import { FONT } from '$lib/server/pdf';
import { temperatureChart, vapourChart, CHART_COLOURS } from './charts';
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
import type { ReportSnapshot, SnapshotElement } from './snapshot';

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
	if (c) parts.push(c.outcome === 'none' ? 'none' : c.outcome === 'dries' ? 'dries out' : 'accumulates');
	else parts.push(condensationNotAssessed(r)!.short);
	if (s) parts.push(s.pass ? 'fRsi passes' : 'fRsi fails');
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

/** A heading and the block after it, kept on one page. */
function keep(head: Content, next: Content): Content {
	return { stack: [head, next], unbreakable: true } as Content;
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

function th(text: string, right = false): TableCell {
	return { text, bold: true, color: SOFT, fontSize: 7.5, alignment: right ? 'right' : 'left' } as TableCell;
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
			th('λ W/(m·K) or R m²·K/W', true),
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
			groundBranch(g) === 'dt < B′'
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
	items.push(
		'Every layer is taken as continuous over the element area, with the thickness and material values listed; values from the library are copied from the revision named beside each layer.'
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
				text: `I declare that I carried out the assessment in this report of ${what} myself, on the information described in it: the build-ups and their sources, the areas, the internal conditions, the climate and the limit table stated, with the calculation engine and the methods named. Its results support, and do not replace, professional judgement.`,
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
		out.push(keep(h2('2', 'Assumptions, validity and cautions'), assumptions(el, null)));
		out.push(cautionsBlock(s.document.scope !== 'element'));
		if (s.document.scope === 'element') out.push(declarationBlock(s, '3'));
		return out;
	}
	out.push(keep(h2('1', 'Construction'), { text: constructionInWords(el), margin: [0, 0, 0, 4] } as Content));
	out.push(layerTable(el, r));
	out.push(keep(h2('2', 'Method'), methodStatement(r)));
	out.push(keep(h2('3', 'Thermal resistance, U-value and limit'), thermalTable(el, r, s)));
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
	out.push(keep(h2('2', 'Cautions'), cautionsBlock(false)));
	return out;
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
		content.push(...dwellingSummary(s));
		s.elements.forEach((el, i) => {
			content.push({ text: '', pageBreak: 'after' } as Content);
			content.push(...elementSection(s, el, { index: i, of: s.elements.length }));
		});
		if (s.evidence?.length) {
			content.push({ text: '', pageBreak: 'after' } as Content);
			content.push(...evidenceBlock(s, h1('Evidence', `Dwelling ${s.dwelling.reference}`)));
		}
		// The declaration closes the dwelling report, on a page of its own.
		content.push({ text: '', pageBreak: 'after' } as Content);
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
			h2: { fontSize: 10.5, bold: true, margin: [0, 12, 0, 4] }
		}
	};
}
