// The PDF's text layer keeps every character across documents: fonts are parsed once and shared by
// every document of the process (src/lib/server/pdf.ts), so what one document's shaping does to a
// shared glyph must not change what a later document's text says. Read back with poppler's pdftotext
// (Debian poppler-utils), a tool outside the project.
import { execFileSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { FONT, renderPdf } from '../../../src/lib/server/pdf';

const work = mkdtempSync(path.join(tmpdir(), 'envelo-pdf-text-'));
let n = 0;
function text(pdf: Buffer): string {
	const file = path.join(work, `d${n++}.pdf`);
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', [file, '-'], { encoding: 'utf8' });
}
const doc = (line: string) => ({ content: [{ text: line }], defaultStyle: { font: FONT } });

describe('the text layer of documents that share fonts', () => {
	it('keeps apostrophes, quotes and dashes, whatever an earlier document held', async () => {
		const lines = [
			'He said "the wall is damp" and left.',
			"The assessor's note: it isn't dry — ‘check’ the dwelling’s “north” wall.",
			'Plain text with fi and fl ligatures: office, flat roof, affirm.',
			"Again the assessor's note, isn't it? 1/2 ½ °C λ = 0,035 W/(m·K)"
		];
		for (const line of lines) {
			const got = text(await renderPdf(doc(line)));
			// a ligature is one glyph standing for its letters (ff → U+FB00); NFKC spells it out again
			expect(got.normalize('NFKC').replace(/\s+/g, ' ').trim()).toBe(line.normalize('NFKC'));
		}
	});
});
