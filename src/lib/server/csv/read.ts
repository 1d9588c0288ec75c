/**
 * Reading uploaded CSV files safely, for any import: size limit, refusal of binary and non-UTF-8
 * files, BOM, delimiter and decimal-comma detection, and row-by-row parsing with papaparse (step
 * callbacks, so no array of every row is built) with the physical line number of each record.
 * `readCsvStream` does all of it on a stream of bytes, chunk by chunk, so the file is never held whole.
 * Relative imports only: the benchmark loads this file outside SvelteKit.
 */
import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import Papa from 'papaparse';
import { AppError } from '$lib/server/errors';

export const DEFAULT_MAX_BYTES = 10 * 1024 * 1024;

/** A problem with the file as a whole (400); `line` when it can be placed. Answers `{ message, code, line }`. */
export class CsvFileError extends AppError {
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
			| 'quotes'
			| 'line-ends',
		readonly line?: number
	) {
		super(400, message, { code, line: line ?? null });
	}
}

export type Delimiter = ',' | ';';

const blankFirstLine = () =>
	new CsvFileError(
		'Line 1 is blank: the first line must be the header, the names of the columns. Remove the blank lines at the top of the file.',
		'header',
		1
	);

/** The longest header line and the longest single record read before the file is refused. */
const HEADER_MAX = 64 * 1024;
const RECORD_MAX = 256 * 1024;

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

/**
 * Line ends in bytes[0, end): a LF, or a CR not followed by LF (files saved with CR alone, as some
 * spreadsheet programs do). A CR that is the last byte is left for the caller to place.
 */
function lineEnds(b: Uint8Array, end: number): number {
	let n = 0;
	for (let i = 0; i < end && i < b.length; i++) {
		const c = b[i];
		if (c === 0x0a) n++;
		else if (c === 0x0d && i + 1 < b.length && b[i + 1] !== 0x0a) n++;
	}
	return n;
}

/** The line (from 1) that the byte at `index` is on. */
function lineAt(bytes: Uint8Array, index: number): number {
	return 1 + lineEnds(bytes, index);
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

/** Refuse a file by its first bytes: spreadsheet workbooks and UTF-16 text. */
function refuseByHead(head: Uint8Array): void {
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
}

const binaryError = (line: number) =>
	new CsvFileError(
		`This looks like a binary file, not CSV text (a zero byte at line ${line}). Save the data as "CSV UTF-8" and upload that.`,
		'binary',
		line
	);

function notUtf8Error(byte: number, line: number): CsvFileError {
	const hex = byte.toString(16).toUpperCase().padStart(2, '0');
	const latin1 = byte >= 0xa0 ? ` (in Latin-1 that byte is '${String.fromCharCode(byte)}')` : '';
	return new CsvFileError(
		`The file is not UTF-8 text: line ${line} has the byte 0x${hex}${latin1}. It was probably saved as Latin-1 or Windows-1252; save it as "CSV UTF-8" and upload again.`,
		'not-utf8',
		line
	);
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
	refuseByHead(bytes.subarray(0, 8));
	const nul = bytes.indexOf(0);
	if (nul >= 0) throw binaryError(lineAt(bytes, nul));
	let bad = -1;
	try {
		new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		bad = firstInvalidUtf8(bytes);
	}
	if (bad >= 0) throw notUtf8Error(bytes[bad], lineAt(bytes, bad));
	const bom = bytes[0] === 0xef && bytes[1] === 0xbb && bytes[2] === 0xbf;
	const text = new TextDecoder('utf-8', { ignoreBOM: true }).decode(bom ? bytes.subarray(3) : bytes);
	return { text, bom };
}

/** Bytes, or a stream of byte chunks (a Node stream, a web ReadableStream, an async generator). */
export type ByteSource = Uint8Array | AsyncIterable<Uint8Array>;

const CHUNK = 64 * 1024;

async function* chunksOf(source: ByteSource): AsyncGenerator<Uint8Array> {
	if (source instanceof Uint8Array) {
		for (let i = 0; i < source.length; i += CHUNK) yield source.subarray(i, i + CHUNK);
		return;
	}
	for await (const c of source) yield c instanceof Uint8Array ? c : new Uint8Array(c as ArrayBuffer);
}

/** The bytes at the end of `b` that start a UTF-8 sequence the next chunk completes (0 to 3 bytes). */
function incompleteTail(b: Uint8Array): number {
	for (let back = 1; back <= Math.min(3, b.length); back++) {
		const c = b[b.length - back];
		if ((c & 0xc0) === 0x80) continue; // a continuation byte: look further back
		const need = c >= 0xf0 ? 4 : c >= 0xe0 ? 3 : c >= 0xc0 ? 2 : 1;
		return need > back ? back : 0;
	}
	return 0;
}

/** What reading a file told, besides its rows. */
export type StreamedFile = {
	bytes: number;
	bom: boolean;
	delimiter: Delimiter;
	headers: string[];
	rows: number;
	/** SHA-256 of the bytes as uploaded */
	sha256: string;
};

/**
 * Read a CSV upload from a stream of bytes, one chunk at a time: the size limit, binary and non-UTF-8
 * files (with the line of the first bad byte), BOM, delimiter, then every record through papaparse.
 * `onHeader` gets the header line (and may be async, e.g. to look up a saved mapping) before any row;
 * `onRow` gets each data record and the physical line it starts on. Empty lines are skipped. A record
 * with fewer cells than the header is passed on (the caller decides), except when it is the last
 * record of a file that does not end with a newline: that file was cut short.
 */
export async function readCsvStream(
	source: ByteSource,
	opts: { maxBytes?: number; /** the size the sender declared, when known */ size?: number },
	onHeader: (headers: string[], delimiter: Delimiter) => void | Promise<void>,
	onRow: RowHandler
): Promise<StreamedFile> {
	const maxBytes = opts.maxBytes ?? DEFAULT_MAX_BYTES;
	const size = source instanceof Uint8Array ? source.length : opts.size;
	if (size !== undefined) checkSize(size, maxBytes);
	const hash = createHash('sha256');
	let total = 0;
	let bom = false;
	let tail = ''; // the last characters of the text, to tell whether it ends with a line end

	// Bytes → checked text, chunk by chunk.
	async function* text(): AsyncGenerator<string> {
		const decoder = new TextDecoder('utf-8', { fatal: true }); // strips a leading BOM
		const it = chunksOf(source)[Symbol.asyncIterator]();
		let head = new Uint8Array(0);
		let started = false;
		let pending = new Uint8Array(0); // an incomplete UTF-8 sequence carried from the last chunk
		let newlines = 0; // line ends before the current chunk
		let endedWithCR = false; // the last chunk ended with a CR: a line end unless this one starts with LF
		try {
			for (;;) {
				const next = await it.next();
				if (next.done) break;
				const chunk = next.value;
				total += chunk.length;
				if (total > maxBytes) {
					// Refused at once: the rest is not read (the caller drains the request).
					if (size !== undefined && size > maxBytes) checkSize(size, maxBytes);
					throw new CsvFileError(
						`The file is larger than ${mb(maxBytes)}, the limit. Split it into smaller files and import them one after another.`,
						'too-large'
					);
				}
				hash.update(chunk);
				let bytes = chunk;
				if (!started) {
					// Hold the first few bytes until the kind of file can be told from them.
					const h = new Uint8Array(head.length + chunk.length);
					h.set(head);
					h.set(chunk, head.length);
					if (h.length < 4) {
						head = h;
						continue;
					}
					refuseByHead(h.subarray(0, 8));
					bom = h[0] === 0xef && h[1] === 0xbb && h[2] === 0xbf;
					started = true;
					bytes = h;
				}
				if (endedWithCR && bytes[0] !== 0x0a) newlines++;
				endedWithCR = bytes[bytes.length - 1] === 0x0d;
				const nul = bytes.indexOf(0);
				if (nul >= 0) throw binaryError(newlines + lineAt(bytes, nul));
				let out: string;
				try {
					out = decoder.decode(bytes, { stream: true });
				} catch {
					const joined = new Uint8Array(pending.length + bytes.length);
					joined.set(pending);
					joined.set(bytes, pending.length);
					const bad = Math.max(0, firstInvalidUtf8(joined));
					// `pending` holds only bytes of a multi-byte character, no line ends
					throw notUtf8Error(joined[bad], newlines + lineAt(joined, bad));
				}
				const last = new Uint8Array(pending.length + Math.min(3, bytes.length));
				last.set(pending);
				last.set(bytes.subarray(bytes.length - Math.min(3, bytes.length)), pending.length);
				const keep = incompleteTail(last);
				pending = last.slice(last.length - keep);
				newlines += lineEnds(bytes, bytes.length);
				if (out) {
					tail = (tail + out).slice(-4);
					yield out;
				}
			}
			if (!started && head.length > 0) {
				refuseByHead(head);
				const nul = head.indexOf(0);
				if (nul >= 0) throw binaryError(lineAt(head, nul));
				bom = head[0] === 0xef && head[1] === 0xbb && head[2] === 0xbf;
				pending = head;
			}
			let out: string;
			try {
				out = decoder.decode(started ? undefined : head);
			} catch {
				const bad = Math.max(0, firstInvalidUtf8(pending));
				throw notUtf8Error(pending[bad], newlines + lineAt(pending, bad));
			}
			if (out) {
				tail = (tail + out).slice(-4);
				yield out;
			}
		} finally {
			await it.return?.(undefined);
		}
	}

	// The header line decides the delimiter and the mapping before any row is read.
	const chunks = text()[Symbol.asyncIterator]();
	try {
		return await readRecords(
			chunks,
			() => total,
			() => bom,
			() => tail,
			() => hash.digest('hex'),
			onHeader,
			onRow
		);
	} finally {
		await chunks.return?.(undefined);
	}
}

async function readRecords(
	chunks: AsyncIterator<string>,
	total: () => number,
	bom: () => boolean,
	tail: () => string,
	digest: () => string,
	onHeader: (headers: string[], delimiter: Delimiter) => void | Promise<void>,
	onRow: RowHandler
): Promise<StreamedFile> {
	// Read until the header record is complete (or the file ends): up to its first line end outside
	// quotes, so a header cell with a line break in it (as spreadsheets allow) stays one cell.
	let head = '';
	let ended = false;
	let scanned = 0;
	let inQuotes = false;
	let nonBlank = false;
	let headerEnd = -1; // index of the line end that closes the header record
	const scan = () => {
		for (; scanned < head.length; scanned++) {
			const c = head[scanned];
			if (c === '"') inQuotes = !inQuotes;
			else if ((c === '\n' || c === '\r') && !inQuotes) {
				if (!nonBlank) continue; // blank so far: the file may hold nothing else
				// A '\r' that ends what has come so far may be the first half of '\r\n': wait for more.
				if (c === '\r' && scanned === head.length - 1 && !ended) return false;
				headerEnd = scanned;
				return true;
			} else if (c !== ' ' && c !== '\t') nonBlank = true;
		}
		return false;
	};
	while (!scan()) {
		if (ended) break;
		if (!nonBlank && head.length > HEADER_MAX) {
			// Only blank lines so far: keep one, to say so (or that the file is empty) at the end.
			head = '\n';
			scanned = 1;
		}
		if (head.length > HEADER_MAX) {
			throw new CsvFileError(
				`Line 1 has no line end within its first ${HEADER_MAX / 1024} kB: the header line should hold only the column names. Check that this is a CSV file.`,
				'header',
				1
			);
		}
		const n = await chunks.next();
		if (n.done) ended = true;
		else head += n.value;
	}
	if (total() === 0) throw new CsvFileError('The file is empty: it has no header and no rows.', 'empty');
	if (head.trim() === '') throw new CsvFileError('The file is empty: it has only blank lines.', 'empty');
	if (/^[ \t]*[\r\n]/.test(head)) throw blankFirstLine();
	// The line end is the header record's own: a quoted field further on may hold another kind.
	const newline =
		headerEnd < 0
			? undefined
			: head[headerEnd] === '\n'
				? '\n'
				: head[headerEnd + 1] === '\n'
					? '\r\n'
					: '\r';
	const firstLine = headerEnd < 0 ? head : head.slice(0, headerEnd);
	const delimiter = detectDelimiter(firstLine);
	const headers =
		Papa.parse<string[]>(firstLine, { delimiter, newline: newline as '\n' | undefined }).data[0]?.map((h) =>
			h.trim()
		) ?? [];
	await onHeader(headers, delimiter);

	const nlChar = newline === '\r' ? '\r' : '\n';
	let line = 1; // the physical line the next record starts on
	let seenHeader = false;
	let rows = 0;
	let pendingShort: { line: number; cells: number } | null = null;
	let quoteError: { line: number; message: string } | null = null;
	let pendingChars = 0; // text handed to papaparse since it last finished a record
	let failed: unknown = null;

	const input = Readable.from(
		(async function* () {
			pendingChars = head.length;
			yield head;
			for (;;) {
				// papaparse reads an unfinished record again with every chunk: bound how far one may run.
				if (pendingChars > RECORD_MAX) {
					throw new CsvFileError(
						`Line ${line}: one row runs on past ${RECORD_MAX / 1024} kB of text, most likely because a quoted field is never closed (a missing " ). The rest of the file cannot be read reliably.`,
						'quotes',
						line
					);
				}
				const n = await chunks.next();
				if (n.done) return;
				pendingChars += n.value.length;
				yield n.value;
			}
		})(),
		{ objectMode: true }
	);
	await new Promise<void>((resolve, reject) => {
		Papa.parse<string[]>(input as unknown as File, {
			delimiter,
			newline: newline as '\r\n' | '\n' | '\r' | undefined,
			quoteChar: '"',
			skipEmptyLines: false,
			step: (res, parser) => {
				try {
					const cells = res.data;
					const start = line;
					let spans = 1;
					for (const c of cells) {
						for (let i = c.indexOf(nlChar); i >= 0; i = c.indexOf(nlChar, i + 1)) spans++;
					}
					line += spans;
					pendingChars = 0;
					for (const e of res.errors) {
						if (e.type === 'Quotes' && !quoteError) {
							quoteError = {
								line: start,
								message:
									e.code === 'InvalidQuotes'
										? `Line ${start} opens a quoted field that is never closed properly: a closing quote is missing, or text follows it (inside quotes, write a quote as two: ""). The rest of the file cannot be read reliably.`
										: `Line ${start} opens a quoted field that is never closed (a missing " ); the rest of the file cannot be read reliably.`
							};
						}
					}
					if (cells.length === 1 && cells[0] === '') return; // an empty line
					if (!seenHeader) {
						seenHeader = true;
						return;
					}
					if (newline === '\r\n' && cells.length > headers.length && cells.some((c) => c.includes('\n'))) {
						// Rows that end with LF alone run together when the header ends with CR LF.
						throw new CsvFileError(
							`Line ${start} ends with a line feed alone while the header line ends with CR LF: the file mixes two kinds of line end. Save it again from the spreadsheet program (or convert its line ends) and upload again.`,
							'line-ends',
							start
						);
					}
					rows++;
					pendingShort = cells.length < headers.length ? { line: start, cells: cells.length } : null;
					onRow(cells, start);
				} catch (e) {
					failed = e;
					parser.abort();
					input.destroy();
				}
			},
			complete: () => resolve(),
			error: (e: unknown) => reject(e)
		});
	});
	if (failed) throw failed;
	if (quoteError) {
		const q = quoteError as { line: number; message: string };
		throw new CsvFileError(q.message, 'quotes', q.line);
	}
	const endsWithNewline = /\r?\n\s*$|\r\s*$/.test(tail());
	const short = pendingShort as { line: number; cells: number } | null;
	if (short && !endsWithNewline) {
		throw new CsvFileError(
			`Line ${short.line}, the last line, has ${short.cells} of ${headers.length} columns and no line end: the file looks cut short. Export it again and upload the whole file.`,
			'truncated',
			short.line
		);
	}
	if (rows === 0) {
		throw new CsvFileError('The file has a header line but no data rows.', 'header-only', 1);
	}
	return { bytes: total(), bom: bom(), delimiter, headers, rows, sha256: digest() };
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
export function detectDelimiter(headerLine: string): Delimiter {
	const first = headerLine;
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
