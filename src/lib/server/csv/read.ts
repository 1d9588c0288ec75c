/**
 * Reading uploaded CSV files safely, for any import: size limit, refusal of binary and non-UTF-8
 * files, BOM, delimiter and decimal-comma detection, and row-by-row parsing with papaparse (step
 * callbacks, so no array of every row is built) with the physical line number of each record.
 * Relative imports only: the benchmark loads this file outside SvelteKit.
 */
import Papa from 'papaparse';

export const DEFAULT_MAX_BYTES = 10 * 1024 * 1024;

/** A problem with the file as a whole; `line` when it can be placed. */
export class CsvFileError extends Error {
	constructor(
		message: string,
		readonly code:
			| 'too-large'
			| 'empty'
			| 'binary'
			| 'not-utf8'
			| 'delimiter'
			| 'header-only'
			| 'header'
			| 'truncated'
			| 'quotes',
		readonly line?: number
	) {
		super(message);
		this.name = 'CsvFileError';
	}
}

export type Delimiter = ',' | ';';

export type CsvInfo = {
	bytes: number;
	bom: boolean;
	delimiter: Delimiter;
	/** ',' when any numeric cell used a decimal comma (only possible with ';' as delimiter) */
	decimal: '.' | ',';
	headers: string[];
	rows: number;
};

const mb = (n: number) => `${(n / 1024 / 1024).toFixed(1)} MB`;

/** Refuse a file by its size before reading it (e.g. from Content-Length). */
export function checkSize(bytes: number, maxBytes = DEFAULT_MAX_BYTES): void {
	if (bytes > maxBytes) {
		throw new CsvFileError(
			`The file is ${mb(bytes)}; the limit is ${mb(maxBytes)}. Split it into smaller files and import them one after another.`,
			'too-large'
		);
	}
}

function lineAt(bytes: Uint8Array, index: number): number {
	let line = 1;
	for (let i = 0; i < index && i < bytes.length; i++) if (bytes[i] === 0x0a) line++;
	return line;
}

/** Find the first byte sequence that is not valid UTF-8 (RFC 3629), or -1. */
function firstInvalidUtf8(b: Uint8Array): number {
	let i = 0;
	while (i < b.length) {
		const c = b[i];
		if (c < 0x80) {
			i++;
			continue;
		}
		let n = 0;
		let min = 0;
		if (c >= 0xc2 && c <= 0xdf) ((n = 1), (min = 0x80));
		else if (c >= 0xe0 && c <= 0xef) ((n = 2), (min = 0x800));
		else if (c >= 0xf0 && c <= 0xf4) ((n = 3), (min = 0x10000));
		else return i;
		if (i + n >= b.length) return i;
		let cp = c & (0x3f >> n);
		for (let k = 1; k <= n; k++) {
			const cc = b[i + k];
			if (cc === undefined || (cc & 0xc0) !== 0x80) return i;
			cp = (cp << 6) | (cc & 0x3f);
		}
		if (cp < min || cp > 0x10ffff || (cp >= 0xd800 && cp <= 0xdfff)) return i;
		i += n + 1;
	}
	return -1;
}

/**
 * Check the bytes of an upload and turn them into text: refuses empty, over-size, binary and
 * non-UTF-8 files with a message that says what to do. Strips a UTF-8 byte-order mark.
 */
export function decodeUpload(
	bytes: Uint8Array,
	maxBytes = DEFAULT_MAX_BYTES
): { text: string; bom: boolean } {
	checkSize(bytes.length, maxBytes);
	if (bytes.length === 0) throw new CsvFileError('The file is empty: it has no header and no rows.', 'empty');
	const head = bytes.subarray(0, 8);
	if (head[0] === 0x50 && head[1] === 0x4b && head[2] === 0x03 && head[3] === 0x04) {
		throw new CsvFileError(
			'This is a spreadsheet workbook (a zip file), not CSV text. In the spreadsheet program, save it as "CSV UTF-8" and upload that.',
			'binary'
		);
	}
	if (head[0] === 0xd0 && head[1] === 0xcf && head[2] === 0x11 && head[3] === 0xe0) {
		throw new CsvFileError(
			'This is an old-style spreadsheet workbook, not CSV text. Save it as "CSV UTF-8" and upload that.',
			'binary'
		);
	}
	if ((head[0] === 0xff && head[1] === 0xfe) || (head[0] === 0xfe && head[1] === 0xff)) {
		throw new CsvFileError('The file is UTF-16 text; save it as "CSV UTF-8" and upload again.', 'not-utf8');
	}
	const nul = bytes.indexOf(0);
	if (nul >= 0) {
		throw new CsvFileError(
			`This looks like a binary file, not CSV text (a zero byte at line ${lineAt(bytes, nul)}). Save the data as "CSV UTF-8" and upload that.`,
			'binary',
			lineAt(bytes, nul)
		);
	}
	let bad = -1;
	try {
		new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		bad = firstInvalidUtf8(bytes);
	}
	if (bad >= 0) {
		const line = lineAt(bytes, bad);
		const byte = bytes[bad].toString(16).toUpperCase().padStart(2, '0');
		const latin1 =
			bytes[bad] >= 0xa0 ? ` (in Latin-1 that byte is '${String.fromCharCode(bytes[bad])}')` : '';
		throw new CsvFileError(
			`The file is not UTF-8 text: line ${line} has the byte 0x${byte}${latin1}. It was probably saved as Latin-1 or Windows-1252; save it as "CSV UTF-8" and upload again.`,
			'not-utf8',
			line
		);
	}
	const bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
	const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bom ? bytes.subarray(3) : bytes);
	return { text, bom };
}

/** Count a character outside double quotes in one line of text. */
function countOutsideQuotes(line: string, ch: string): number {
	let inQuotes = false;
	let n = 0;
	for (const c of line) {
		if (c === '"') inQuotes = !inQuotes;
		else if (c === ch && !inQuotes) n++;
	}
	return n;
}

/** The delimiter of the header line: comma or semicolon; anything else is refused with its name. */
export function detectDelimiter(text: string): Delimiter {
	const end = text.search(/\r?\n/);
	const first = end < 0 ? text : text.slice(0, end);
	const commas = countOutsideQuotes(first, ',');
	const semis = countOutsideQuotes(first, ';');
	if (semis > commas) return ';';
	if (commas > 0) return ',';
	const tabs = countOutsideQuotes(first, '\t');
	const pipes = countOutsideQuotes(first, '|');
	if (tabs > 0 || pipes > 0) {
		const what = tabs >= pipes ? 'tabs' : "vertical bars '|'";
		throw new CsvFileError(
			`Line 1 separates its columns with ${what}. Envelo reads commas or semicolons: save the file as CSV (comma- or semicolon-separated).`,
			'delimiter',
			1
		);
	}
	throw new CsvFileError(
		'Line 1 has a single column: no comma or semicolon separates the column names. Check that this is the CSV file you meant.',
		'delimiter',
		1
	);
}

const DECIMAL_POINT = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;
const DECIMAL_COMMA = /^[+-]?(\d+,?\d*|,\d+)$/;
const GROUPED = /^[+-]?\d{1,3}([  ]\d{3})+([.,]\d+)?$/; // 1 200 or 1 200,5 (space or no-break space)

export type NumberResult =
	{ ok: true; value: number | null; comma: boolean } | { ok: false; message: string };

/**
 * Read a number as people type it in spreadsheets: a point, or a comma in a semicolon-separated
 * file; digits grouped by spaces. Empty is null. Anything else says why it is not a number.
 */
export function parseNumber(raw: string, delimiter: Delimiter): NumberResult {
	let s = raw.trim();
	if (s === '') return { ok: true, value: null, comma: false };
	const shown = `'${raw.length > 24 ? raw.slice(0, 24) + '…' : raw}'`;
	if (GROUPED.test(s)) s = s.replace(/[  ]/g, '');
	if (DECIMAL_POINT.test(s)) return { ok: true, value: Number(s), comma: false };
	if (DECIMAL_COMMA.test(s)) {
		if (delimiter === ';') return { ok: true, value: Number(s.replace(',', '.')), comma: true };
		return {
			ok: false,
			message: `${shown} is not a number here: a decimal comma needs a semicolon-separated file (or write ${s.replace(',', '.')})`
		};
	}
	if (/\d/.test(s) && /[.,]/.test(s) && /^[+-]?[\d.,]+$/.test(s)) {
		return { ok: false, message: `${shown} is not a number: it mixes points and commas` };
	}
	return { ok: false, message: `${shown} is not a number` };
}

export type RowHandler = (cells: string[], line: number) => void;

/**
 * Parse CSV text row by row with papaparse. Calls `onHeader` once with the first record, then
 * `onRow` with each data record and the physical line it starts on. Empty lines are skipped.
 * A record with fewer cells than the header is passed on (the caller decides), except when it is
 * the last record of a file that does not end with a newline: that file was cut short.
 */
export function parseCsv(
	text: string,
	delimiter: Delimiter,
	onHeader: (headers: string[]) => void,
	onRow: RowHandler
): { rows: number } {
	let prev = 0;
	let linesBefore = 1; // the line number at offset `prev`
	let headers: string[] | null = null;
	let rows = 0;
	let pendingShort: { line: number; cells: number } | null = null;
	let quoteError: { line: number; message: string } | null = null;

	Papa.parse<string[]>(text, {
		delimiter,
		newline: text.includes('\r\n')
			? '\r\n'
			: text.includes('\n')
				? '\n'
				: text.includes('\r')
					? '\r'
					: undefined,
		quoteChar: '"',
		skipEmptyLines: true,
		step: (res) => {
			const cursor = res.meta.cursor;
			let i = prev;
			while (i < cursor && (text.charCodeAt(i) === 10 || text.charCodeAt(i) === 13)) {
				if (text.charCodeAt(i) === 10) linesBefore++;
				i++;
			}
			const startLine = linesBefore;
			for (; i < cursor; i++) if (text.charCodeAt(i) === 10) linesBefore++;
			prev = cursor;
			for (const e of res.errors) {
				if (e.type === 'Quotes' && !quoteError) {
					quoteError = {
						line: startLine,
						message: `Line ${startLine} opens a quoted field that is never closed (a missing " ); the rest of the file cannot be read reliably.`
					};
				}
			}
			const cells = res.data;
			if (!headers) {
				headers = cells;
				onHeader(cells);
				return;
			}
			rows++;
			pendingShort = cells.length < headers.length ? { line: startLine, cells: cells.length } : null;
			onRow(cells, startLine);
		}
	});
	if (quoteError) {
		const q = quoteError as { line: number; message: string };
		throw new CsvFileError(q.message, 'quotes', q.line);
	}
	if (!headers) throw new CsvFileError('The file is empty: it has no header and no rows.', 'empty');
	const endsWithNewline = /\r?\n\s*$/.test(text.slice(-4));
	const short = pendingShort as { line: number; cells: number } | null;
	if (short && !endsWithNewline) {
		throw new CsvFileError(
			`Line ${short.line}, the last line, has ${short.cells} of ${(headers as string[]).length} columns and no line end: the file looks cut short. Export it again and upload the whole file.`,
			'truncated',
			short.line
		);
	}
	if (rows === 0) {
		throw new CsvFileError('The file has a header line but no data rows.', 'header-only', 1);
	}
	return { rows };
}
