// The dwelling report opens with the summary for the client in plain words, on pages of its own before
// the technical ones, and its tables keep a unit on one line. Rendered from snapshots built in memory
// (client-snapshot.ts: invented build-ups and climate, the engine's own results) and read back as
// poppler's pdftotext (Debian poppler-utils) reads it.
import { describe, expect, it, afterAll } from 'vitest';
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { renderPdf } from '../../../src/lib/server/pdf';
import { headingPieces, reportDocument } from '../../../src/lib/server/reports/document';
import { clientSummary } from '../../../src/lib/reports/client-summary';
import {
	CAVITY_WALL,
	DOOR,
	FLOOR,
	ROOF,
	SOLID_WALL,
	TIMBER_WALL,
	WINDOWS,
	clientSnapshot
} from './client-snapshot';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-client-summary-'));
afterAll(() => rmSync(work, { recursive: true, force: true }));

/** The pages as text: `raw` in reading order, whitespace folded; `layout` with lines kept. */
function read(pdf: Buffer, mode: 'raw' | 'layout' = 'raw'): string[] {
	const file = path.join(work, `r-${Math.random().toString(36).slice(2)}.pdf`);
	writeFileSync(file, pdf);
	return (
		execFileSync('pdftotext', [`-${mode}`, file, '-'], { encoding: 'utf8' })
			.split('\f')
			.filter((p) => p.trim())
			// the font's ligatures (ﬀ, ﬁ) read back as the letters they join
			.map((p) =>
				mode === 'raw' ? p.replace(/[\ufb00-\ufb04]/g, (c) => c.normalize('NFKC')).replace(/\s+/g, ' ') : p
			)
	);
}

describe('the summary for the client in the dwelling report', async () => {
	const elements = [CAVITY_WALL(), SOLID_WALL(), TIMBER_WALL(), ROOF(), FLOOR(), WINDOWS(), DOOR()];
	const snapshot = clientSnapshot(elements);
	const pdf = await renderPdf(reportDocument(snapshot));
	const pages = read(pdf);
	const technical = pages.findIndex((p) => p.includes('DWELLING REPORT'));

	it('comes first, on pages of its own, before the technical summary', () => {
		expect(pages[0]).toContain('SUMMARY FOR THE CLIENT Your home in plain words');
		expect(technical).toBeGreaterThan(0);
		const front = pages.slice(0, technical).join(' ');
		// none of the technical pages' words on the client's pages, none of the client's on theirs
		expect(front).not.toContain('ΣU·A');
		expect(pages.slice(technical).join(' ')).not.toContain('SUMMARY FOR THE CLIENT');
		// the client's pages end with the cautions and the note that the technical pages hold
		expect(pages[technical - 1]).toContain('where the two seem to differ, the technical pages hold');
	});

	it('prints the words of clientSummary: the headline, each element with its verdict, the moisture findings, what to do, the cautions', () => {
		const c = clientSummary(snapshot);
		const front = pages.slice(0, technical).join(' ');
		expect(front).toContain(`In short: ${c.headline.text}`);
		expect(c.headline.tone).toBe('fail');
		expect(front).toContain('Prepared for Sam Client');
		// the solid brick wall's U-value is far above 0.30 (215 mm brick, λ 0.77, no insulation:
		// RT = 0.13 + 0.013/0.5 + 0.215/0.77 + 0.04 ≈ 0.475 m²·K/W, U ≈ 2.1 W/(m²·K); ISO 6946:2017
		// surface resistances, Table 7)
		expect(front).toMatch(/Solid brick wall Outside wall 2\.\d\d 0\.30 does not meet its limit/);
		expect(front).toMatch(/Cavity wall Outside wall 0\.\d\d 0\.30 meets its limit/);
		expect(front).toContain('Front door Door 1.80 none set no limit set');
		for (const f of [...c.heatLoss.paragraphs, ...c.moisture.paragraphs, ...c.nextSteps.items])
			expect(front).toContain(f.text);
		for (const x of c.cautions.items) expect(front).toContain(x);
		// each finding of a tone carries its word, not colour alone
		expect(front).toContain('Needs attention: One element does not meet its limit');
		expect(front).toContain('Worth knowing: In “Cavity wall”');
	});

	it('never leaves a heading as the last line of a client page', () => {
		for (const p of read(pdf, 'layout').slice(0, technical)) {
			const lines = p.split('\n').filter((l) => l.trim() && !/Verify this report|Page \d+ of/.test(l));
			expect(lines[lines.length - 1]).not.toMatch(
				/^\s*(What was assessed|Heat loss|Damp and mould|What to do next|Please keep in mind)\s*$/
			);
		}
	});

	it('is not printed in an element report, which keeps its own first page', async () => {
		const element = clientSnapshot([CAVITY_WALL()]);
		element.document = { ...element.document, scope: 'element' };
		const first = read(await renderPdf(reportDocument(element)))[0];
		expect(first).not.toContain('SUMMARY FOR THE CLIENT');
		expect(first).toContain('ELEMENT REPORT');
	});
});

describe('units in table headings', () => {
	it('keeps each unit in one piece', () => {
		expect(headingPieces('λ W/(m·K)\nor R m²·K/W')).toEqual([
			{ text: 'λ ' },
			{ text: 'W/(m·K)', noWrap: true },
			{ text: '\nor R ' },
			{ text: 'm²·K/W', noWrap: true }
		]);
		expect(headingPieces('Total at month end g/m²')).toEqual([
			{ text: 'Total at month end ' },
			{ text: 'g/m²', noWrap: true }
		]);
		expect(headingPieces('Heat loss figure (U-value)')).toEqual([
			{ text: 'Heat loss figure (' },
			{ text: 'U-value', noWrap: true },
			{ text: ')' }
		]);
	});

	it('prints the layer table heading "λ W/(m·K) or R m²·K/W" without splitting a unit', async () => {
		const text = read(await renderPdf(reportDocument(clientSnapshot([CAVITY_WALL()])))).join(' ');
		expect(text).toContain('λ W/(m·K) or R m²·K/W');
		const lines = read(await renderPdf(reportDocument(clientSnapshot([CAVITY_WALL()]))), 'layout')
			.join('\n')
			.split('\n');
		// before, the heading broke as "R m²·K/" over "W"
		expect(lines.some((l) => /m²·K\/\s*$/.test(l) || /W\/\(m²?·?\s*$/.test(l))).toBe(false);
		expect(lines.some((l) => /\bor R m²·K\/W\b/.test(l))).toBe(true);
	});
});
