// The junction pages of the dwelling report and its heat-loss totals, rendered from a snapshot built
// in memory (no database): the text as poppler's pdftotext (Debian poppler-utils) reads it. H_T = ΣU·A
// + Σψ·L is ISO 13789's transmission heat-loss coefficient (as recalled); the sums are checked by
// arithmetic on the snapshot's own figures. Build-ups and climate are invented for the tests.
import { describe, it, expect, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { renderPdf } from '../../../src/lib/server/pdf';
import { reportDocument } from '../../../src/lib/server/reports/document';
import {
	junctionFrame,
	junctionMaterialsPicture,
	junctionTemperaturePicture
} from '../../../src/lib/server/reports/charts';
import { fx } from '../../../src/lib/format';
import { CORNER, EDGE, LINTEL, snapshotWith } from './junction-snapshot';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-junction-pdf-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The pages of a PDF as text in the order it was written (a column after the other), whitespace folded. */
function pages(pdf: Buffer): string[] {
	const file = path.join(work, `r-${Math.random().toString(36).slice(2)}.pdf`);
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-raw', file, '-'], { encoding: 'utf8' })
		.split('\f')
		.filter((p) => p.trim())
		.map((p) => p.replace(/\s+/g, ' '));
}

describe('the dwelling report with junctions', async () => {
	const corner = CORNER();
	const edge = EDGE();
	const snapshot = snapshotWith([corner, edge, LINTEL]);
	const text = pages(await renderPdf(reportDocument(snapshot)));

	it('sums the heat loss on the summary: ΣU·A, Σψ·L and H_T, each junction with its ψ and where it comes from', () => {
		// the technical summary, after the client's summary in plain words
		const summary = text.find((p) => p.includes('DWELLING REPORT'))!;
		expect(text.indexOf(summary)).toBeGreaterThan(0);
		const ua = snapshot.elements.reduce((t, e) => t + e.result!.uValue * e.area, 0);
		const psiL = corner.psi! * 10.4 + edge.psi! * 30 + 0.3 * 6;
		expect(summary).toContain('Junctions and transmission heat loss');
		expect(summary).toContain(`Σψ·L (junctions) ${fx(psiL, 2)} W/K`);
		expect(summary).toContain(`${fx(ua + psiL, 2)} W/K`);
		expect(summary).toMatch(/HT = ΣU·A \+ Σψ·L/);
		expect(summary).toMatch(
			new RegExp(
				`Corners External corner \\(walls\\) 10\\.40 ${fx(corner.psi, 3)} ${fx(corner.psi! * 10.4, 2)} calculated here, external dimensions`
			)
		);
		// an entered ψ: its source named, marked as not calculated here
		expect(summary).toMatch(
			/Lintels Window head 6\.00 0\.300 1\.80 entered, not calculated here source: Default table value, assumed \(test\)/
		);
	});

	it('gives each calculated junction one page: model in words, pictures, ψ with its dimensions, fRsi against the limit, mesh and cautions', () => {
		const junctionPages = text.filter((p) => /JUNCTION \d OF 2/.test(p));
		expect(junctionPages).toHaveLength(2); // one page each; the entered ψ has none
		const [c, e] = junctionPages;
		expect(c).toContain('JUNCTION 1 OF 2 · EXTERNAL CORNER (WALLS) Corners');
		expect(c).toMatch(
			/built from the dwelling’s own elements: “Cavity wall” \(external wall, 4 layers, 313 mm\)/
		);
		expect(c).toContain('Materials, W/(m·K):');
		expect(c).toContain('Cross-section and temperatures');
		expect(c).toMatch(/coldest -?\d+\.\d °C, fRsi 0\.\d{3}/); // the picture's mark, drawn as text of the SVG
		expect(c).toContain(`external dimensions ${fx(corner.result!.psiBySystem.external, 3)} (used)`);
		expect(c).toContain(`fRsi ${fx(corner.result!.surface.fRsi, 3)} with Rsi 0.25 m²·K/W`);
		expect(c).toMatch(/fRsi,min 0\.\d{3} in \w+, the critical month of the dwelling’s climate/);
		expect(c).toMatch(/meets the limit, fRsi ≥ fRsi,min|below the limit, fRsi < fRsi,min/);
		expect(c).toContain('Against 0.75 for dwellings (common practice, no source)');
		expect(c).toMatch(/the last halving changed it by \d+\.\d+ %/);
		expect(c).toMatch(/Mesh: \d levels/);
		expect(c).toContain('do not replace, professional judgement');
		expect(e).toContain('JUNCTION 2 OF 2 · WALL – GROUND FLOOR Ground floor edge');
		expect(e).toContain('“Ground floor” (ground floor, 3 layers, 315 mm)');
	});

	it('sets out the method and cautions common to every junction once, before the junction pages', () => {
		const i = text.findIndex((p) => p.includes('Junctions: method and cautions'));
		expect(i).toBeGreaterThan(0);
		expect(text[i + 1]).toMatch(/JUNCTION 1 OF 2/);
		expect(text[i]).toContain('Steady-state two-dimensional heat conduction (ISO 10211)');
		expect(text[i]).toContain('The fRsi figure of 0.75 for dwellings is common practice with no source here');
		expect(text[text.length - 1]).toContain('Declaration');
		expect(text[text.length - 1]).toContain(
			'the junctions, their lengths and the sources of entered ψ-values'
		);
	});

	it('a snapshot frozen before junctions were reported prints no junction section; one without junctions says so', async () => {
		const old = pages(await renderPdf(reportDocument(snapshotWith(undefined))));
		expect(old.join(' ')).not.toMatch(/Junctions|Σψ·L/);
		const none = pages(await renderPdf(reportDocument(snapshotWith([]))));
		expect(none.find((p) => p.includes('DWELLING REPORT'))).toContain(
			'No junctions (linear thermal bridges) are recorded for this dwelling'
		);
		expect(none.join(' ')).not.toContain('Junctions: method and cautions');
	});

	it('draws the pictures as vector SVG: the materials hatched where λ < 0.1, the field banded with isotherms', () => {
		const frame = junctionFrame({ x0: -100, y0: -100, x1: 1200, y1: 1200 }, 240, 150);
		expect(frame.w).toBeCloseTo(150, 6); // square window, limited by the height
		const materials = junctionMaterialsPicture(corner.model!, frame);
		expect(materials).toMatch(/^<svg /);
		expect(materials).toContain('url(#jm-hatch)');
		const t = junctionTemperaturePicture(
			corner.model!,
			corner.field,
			frame,
			corner.result!.surface.coldest,
			corner.result!.surface.fRsi
		)!;
		expect(t.levels.length).toBeGreaterThan(3);
		expect(t.min).toBeLessThan(t.max);
		expect(t.svg).toContain('<path d="M');
		expect(junctionTemperaturePicture(corner.model!, null, frame, null, null)).toBeNull();
	});
});
