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

let configured = false;

/** Fonts and access policies are process-wide settings of pdfmake; they never change after start. */
function configure() {
	if (configured) return;
	const dir = fontDir();
	const file = (name: string) => path.join(dir, name);
	pdfmake.setFonts({
		[FONT]: {
			normal: file('SourceSans3-Regular.ttf'),
			bold: file('SourceSans3-Semibold.ttf'),
			italics: file('SourceSans3-It.ttf'),
			bolditalics: file('SourceSans3-SemiboldIt.ttf')
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
	const out = pdfmake.createPdf(doc);
	const buf = await out.getBuffer();
	return Buffer.from(buf);
}
