/** The batch audit report as PDF (pdfmake through the shared renderer, Source Sans 3). */
import type { Content, TDocumentDefinitions } from 'pdfmake/interfaces';
import { CAUTIONS } from '$lib/physics';
import { FLAG_LABELS, ITEM_STATE_LABELS, SEVERITY_LABELS } from '$lib/audit/flags';
import { DWELLING_STATUS_LABELS, type DwellingStatus } from '$lib/dwellings/kinds';
import type { Batch, BatchSummary, ItemRow } from '$lib/server/audit';
import { uChartSvg } from './chart';
import { whenUtc } from '$lib/format';
import { FONT, renderPdf } from '$lib/server/pdf';

const th = (t: string, right = false): Content => ({
	text: t,
	bold: true,
	alignment: right ? 'right' : 'left'
});
const num = (n: number | string): Content => ({ text: String(n), alignment: 'right' });

export async function batchReportPdf(
	batch: Batch,
	summary: BatchSummary,
	items: ItemRow[],
	generatedBy: string,
	organisation: string
): Promise<Buffer> {
	const s = batch.sampling;
	const rule =
		s.rule === 'all'
			? 'all dwellings'
			: `random ${s.percent} % with at least ${s.minimumPerAssessor} per assessor`;
	const doc: TDocumentDefinitions = {
		info: { title: `Audit report — ${batch.name}`, creator: 'Envelo' },
		pageSize: 'A4',
		pageMargins: [40, 48, 40, 48],
		defaultStyle: { font: FONT, fontSize: 9, color: '#1f1b16' },
		header: (page, pages) => ({
			columns: [
				{ text: `${organisation} · Audit report · ${batch.name}`, color: '#5b554c' },
				{ text: `page ${page} of ${pages}`, alignment: 'right', color: '#5b554c' }
			],
			margin: [40, 20, 40, 0],
			fontSize: 8
		}),
		content: [
			{ text: `Audit report: ${batch.name}`, fontSize: 16, bold: true },
			{
				text: `Created ${whenUtc(batch.createdAt)} by ${batch.createdByName ?? 'unknown'}; generated ${whenUtc(new Date().toISOString())} by ${generatedBy}.`,
				margin: [0, 2, 0, 0],
				color: '#5b554c'
			},
			{
				text: `Sampling: ${rule}${s.includeFlagged ? ', plus every dwelling that carries a flag' : ''}; seed ${batch.seed}. Drawn from ${batch.counts.population} dwellings; ${summary.items} in the batch. Recomputed: ${batch.progress.finishedAt ? whenUtc(batch.progress.finishedAt) : 'not yet'}.`,
				margin: [0, 2, 0, 8]
			},
			{ text: 'Outcomes', bold: true, fontSize: 11, margin: [0, 4, 0, 2] },
			{
				table: {
					widths: ['*', 60],
					body: [
						[th('Audit / dwelling status'), th('Dwellings', true)],
						...Object.entries(summary.byState).map(([k, v]) => [
							ITEM_STATE_LABELS[k as keyof typeof ITEM_STATE_LABELS],
							num(v)
						]),
						['Resubmissions', num(summary.resubmissions)]
					]
				},
				layout: 'lightHorizontalLines'
			},
			{ text: 'Flags by kind', bold: true, fontSize: 11, margin: [0, 10, 0, 2] },
			summary.flagsByCode.length
				? {
						table: {
							widths: ['*', 40, 40, 40, 50],
							body: [
								[
									th('Flag'),
									th(SEVERITY_LABELS.high, true),
									th(SEVERITY_LABELS.medium, true),
									th(SEVERITY_LABELS.low, true),
									th('Dwellings', true)
								],
								...summary.flagsByCode.map((f) => [
									f.label,
									num(f.high),
									num(f.medium),
									num(f.low),
									num(f.dwellings)
								])
							]
						},
						layout: 'lightHorizontalLines'
					}
				: { text: 'No flags.' },
			{ text: 'Per assessor', bold: true, fontSize: 11, margin: [0, 10, 0, 2] },
			{
				table: {
					widths: ['*', 42, 42, 42, 42, 42, 42, 42],
					body: [
						[
							th('Assessor'),
							th('Dwellings', true),
							th('Flagged', true),
							th('Accepted', true),
							th('Advice', true),
							th('Returned', true),
							th('Open', true),
							th('Resub.', true)
						],
						...summary.perAssessor.map((a) => [
							a.name,
							num(a.dwellings),
							num(a.flagged),
							num(a.accepted),
							num(a.advice),
							num(a.returned),
							num(a.awaiting),
							num(a.resubmissions)
						])
					]
				},
				layout: 'lightHorizontalLines'
			},
			{
				text: 'U-values by element kind against the limits',
				bold: true,
				fontSize: 11,
				margin: [0, 10, 0, 2]
			},
			summary.uByKind.length
				? { svg: uChartSvg(summary.uByKind, { width: 515, height: 210, font: FONT }), width: 515 }
				: { text: 'No recomputed U-values yet.' },
			{
				text: 'Dots: recomputed U of each element (revisions the assessor used). Squares: over the limit. Dashed line: the limit of the limit table in force.',
				fontSize: 7.5,
				color: '#5b554c'
			},
			{ text: 'Dwellings', bold: true, fontSize: 11, margin: [0, 10, 0, 2], pageBreak: 'before' },
			{
				table: {
					headerRows: 1,
					widths: [60, 70, 30, '*', 70, 55],
					body: [
						[
							th('Dwelling'),
							th('Assessor'),
							th('Flags', true),
							th('Flag kinds and comment'),
							th('Audit / dwelling status'),
							th('Decided')
						],
						...items.map((i) => [
							i.reference,
							i.assessorName ?? '—',
							num(i.flags.length),
							{
								stack: [
									{ text: [...new Set(i.flags.map((f) => FLAG_LABELS[f.code]))].join('; ') || '—' },
									...(i.comment ? [{ text: i.comment, italics: true }] : [])
								]
							},
							ITEM_STATE_LABELS[i.state] +
								(i.resubmissions ? ` (resubmitted ${i.resubmissions}×)` : '') +
								`\ndwelling: ${DWELLING_STATUS_LABELS[i.dwellingStatus as DwellingStatus] ?? i.dwellingStatus}`,
							i.decidedAt ? `${whenUtc(i.decidedAt)}\n${i.decidedByName ?? ''}` : '—'
						])
					]
				},
				layout: 'lightHorizontalLines',
				fontSize: 8
			},
			{ text: 'Cautions', bold: true, fontSize: 10, margin: [0, 12, 0, 2] },
			{ ul: [...CAUTIONS], fontSize: 7.5, color: '#5b554c' },
			{
				text: "Every decision, comment, flag and recompute behind this report is kept in the organisation's append-only activity log.",
				fontSize: 7.5,
				color: '#5b554c',
				margin: [0, 4, 0, 0]
			}
		]
	};
	return renderPdf(doc);
}
