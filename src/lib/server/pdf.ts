import { createRequire } from 'node:module';
import fs from 'node:fs';
import path from 'node:path';
import pdfmake from 'pdfmake';
import type { TDocumentDefinitions } from 'pdfmake/interfaces';

/** Family name used in document definitions and inside the chart SVGs. */
export const FONT = 'SourceSans3';

/**
 * The TTF files of the npm package `source-sans` (full character set, embedded as subsets). Located
 * through Node's resolver so the built server finds them from its own folder; nothing is fetched.
 */
function fontDir(): string {
	const candidates: string[] = [];
	try {
		const require = createRequire(import.meta.url);
		candidates.push(path.join(path.dirname(require.resolve('source-sans/package.json')), 'TTF'));
	} catch {
		// resolved from the working directory below
	}
	candidates.push(path.resolve('node_modules/source-sans/TTF'));
	const dir = candidates.find((d) => fs.existsSync(path.join(d, 'SourceSans3-Regular.ttf')));
	if (!dir) throw new Error('Source Sans 3 TTF files not found (npm package source-sans)');
	return dir;
}

/** What this module uses of a fontkit font, of fontkit and of pdfkit's document (they ship no types). */
type FontkitFont = { postscriptName: string; characterSet: number[]; glyphForCodePoint(cp: number): unknown };
type Fontkit = {
	create(buffer: Uint8Array, postscriptName?: string): FontkitFont;
	registerFormat(format: unknown): void;
};
type PdfkitDocument = {
	_registeredFonts: Record<string, unknown>;
	/** the current font: pdfkit's EmbeddedFont, with its fontkit font and its cache of shaped words */
	_font: { font?: unknown; layoutCache?: Record<string, unknown> } | null;
	registerFont(name: string, src: Uint8Array): unknown;
	font(src: unknown, family?: unknown, size?: unknown): unknown;
};

/**
 * Parsed fonts, shared by every document of the process. pdfkit reads a font file and hands its bytes to
 * fontkit.create for each document, and each document then decodes the font's layout and glyph tables
 * anew: most of the time of a short report. So each TTF file is parsed once, here, and stands in each
 * document as a small marker buffer, registered under the file's path with pdfkit's own registerFont; a
 * fontkit format added through fontkit's own registerFormat recognises a marker and returns the parsed
 * font. The document asks for fonts by path exactly as before (pdfmake's text and the chart SVGs alike),
 * so it names and subsets them as before and its bytes are the same; each document still builds its own
 * subset (pdfkit's EmbeddedFont). Safe to share because fontkit is synchronous: no two documents use a
 * font at the same instant.
 */
const parsed = new Map<Uint8Array, FontkitFont>();
/**
 * Shaped words (pdfkit's per-font layout cache: text → glyphs and positions, a pure function of the font
 * and the text), shared by the documents too: shaping with the font's substitution and positioning
 * tables is most of what is left of a report's time. Started afresh every LAYOUT_CACHE_DOCUMENTS
 * documents, so that it stays small.
 */
const layoutCaches = new Map<FontkitFont, Record<string, unknown>>();
const LAYOUT_CACHE_DOCUMENTS = 200;
let documentsSinceFresh = 0;
/** font file path → its marker */
const markers = new Map<string, Buffer>();
let pending: FontkitFont | undefined;

class ParsedFontFormat {
	static probe(buffer: Uint8Array): boolean {
		pending = parsed.get(buffer);
		return pending !== undefined;
	}
	constructor() {
		const font = pending;
		pending = undefined;
		if (!font) throw new Error('parsed-font marker without a font');
		// A constructor may return another object: fontkit's `new format(stream)` yields the parsed font.
		return font as unknown as ParsedFontFormat;
	}
}

/** fontkit and the pdfkit document class that pdfmake uses, resolved from their own folders. */
function pdfkitModules(): { fontkit: Fontkit; PDFKit: { prototype: PdfkitDocument } } {
	const pdfmakeMain = createRequire(import.meta.url).resolve('pdfmake');
	const pdfkitMain = createRequire(pdfmakeMain).resolve('pdfkit');
	const fromPdfkit = createRequire(pdfkitMain);
	return { fontkit: fromPdfkit('fontkit') as Fontkit, PDFKit: fromPdfkit(pdfkitMain) };
}

/** Parse one TTF file once and keep its marker. */
function parseOnce(fontkit: Fontkit, file: string): string {
	const font = fontkit.create(fs.readFileSync(file));
	// fontkit keeps each glyph it makes, with the characters it was first made for; the text layer's
	// character map (ToUnicode) is written from those. Shared by every document, a glyph first made by
	// shaping (a substitution, with no character) would lose its character in every later document:
	// so every glyph of the character map is made here, from its own character, before any shaping.
	for (const cp of font.characterSet) font.glyphForCodePoint(cp);
	// Recognised by no built-in fontkit format (TrueType, OpenType, WOFF, WOFF2, collections, dfont).
	const marker = Buffer.from(`envelo-parsed-font ${path.basename(file)}`, 'latin1');
	parsed.set(marker, font);
	markers.set(file, marker);
	layoutCaches.set(font, Object.create(null));
	return file;
}

let configured = false;

/** Fonts and access policies are process-wide settings of pdfmake; they never change after start. */
function configure() {
	if (configured) return;
	const dir = fontDir();
	const file = (name: string) => path.join(dir, name);
	const { fontkit, PDFKit } = pdfkitModules();
	fontkit.registerFormat(ParsedFontFormat);
	// A document registers a parsed font (path → marker) the first time it asks for that path.
	const font = PDFKit.prototype.font;
	PDFKit.prototype.font = function (this: PdfkitDocument, src: unknown, family?: unknown, size?: unknown) {
		if (typeof src === 'string' && !(src in this._registeredFonts)) {
			const marker = markers.get(src);
			if (marker) this.registerFont(src, marker);
		}
		const result = font.call(this, src, family, size);
		const current = this._font;
		const parsedFont = current?.font as FontkitFont | undefined;
		if (current?.layoutCache && parsedFont && layoutCaches.has(parsedFont)) {
			current.layoutCache = layoutCaches.get(parsedFont);
		}
		return result;
	};
	pdfmake.setFonts({
		[FONT]: {
			normal: parseOnce(fontkit, file('SourceSans3-Regular.ttf')),
			bold: parseOnce(fontkit, file('SourceSans3-Semibold.ttf')),
			italics: parseOnce(fontkit, file('SourceSans3-It.ttf')),
			bolditalics: parseOnce(fontkit, file('SourceSans3-SemiboldIt.ttf'))
		}
	});
	// No URL is ever fetched, and only the font folder is read from disk.
	pdfmake.setUrlAccessPolicy(() => false);
	pdfmake.setLocalAccessPolicy((p: string) => path.resolve(p).startsWith(dir + path.sep));
	configured = true;
}

/** Render a document definition to PDF bytes. */
export async function renderPdf(doc: TDocumentDefinitions): Promise<Buffer> {
	configure();
	if (++documentsSinceFresh > LAYOUT_CACHE_DOCUMENTS) {
		for (const f of layoutCaches.keys()) layoutCaches.set(f, Object.create(null));
		documentsSinceFresh = 1;
	}
	const out = pdfmake.createPdf(doc);
	const buf = await out.getBuffer();
	return Buffer.from(buf);
}
