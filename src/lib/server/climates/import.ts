import Papa from 'papaparse';
import { CsvFileError, decodeUpload } from '$lib/server/csv/read';
import { MONTH_NAMES } from '$lib/format';

/**
 * Reads a climate from a CSV file: a header row naming `month`, `temperature` (°C) and
 * `relative_humidity` (%), then exactly twelve rows, one per month (1–12 or the month's name).
 * Comma, semicolon or tab separated; with semicolons or tabs a decimal comma is accepted.
 * Every problem is reported with its line and column, and nothing is returned unless all is well.
 */

export const CLIMATE_CSV_MAX_BYTES = 64 * 1024;

export type CsvProblem = { line?: number; field?: string; message: string };
export type ClimateCsvResult =
	| {
			ok: true;
			months: { month: number; temperature: number; relativeHumidity: number }[];
			delimiter: string;
	  }
	| { ok: false; problems: CsvProblem[] };

const COLUMN_NAMES: Record<'month' | 'temperature' | 'relative_humidity', string[]> = {
	month: ['month', 'mon', 'month_number'],
	temperature: ['temperature', 'temperature_c', 'temp', 'temp_c', 'theta_e', 'external_temperature', 't'],
	relative_humidity: [
		'relative_humidity',
		'relative_humidity_percent',
		'relative_humidity_pct',
		'rh',
		'rh_percent',
		'rh_pct',
		'humidity',
		'phi_e'
	]
};

const normaliseHeader = (h: string) =>
	h
		.trim()
		.toLowerCase()
		.replace(/\(.*?\)|\[.*?\]/g, '') // units in brackets: "temperature (°C)"
		.replace(/[°%]/g, '')
		.trim()
		.replace(/[\s\-.]+/g, '_')
		.replace(/_+$/, '');

const MONTH_WORDS = new Map<string, number>(
	MONTH_NAMES.flatMap((name, i) => [
		[name.toLowerCase(), i + 1],
		[name.slice(0, 3).toLowerCase(), i + 1]
	])
);

function show(raw: string): string {
	const s = raw.length > 24 ? raw.slice(0, 24) + '…' : raw;
	return `'${s}'`;
}

/** A strict decimal number: digits with an optional sign and one decimal separator. */
function parseNumber(raw: string, decimalComma: boolean): number | null {
	let s = raw.trim().replace(/^\u2212/, '-');
	if (decimalComma) s = s.replace(',', '.');
	if (!/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(s)) return null;
	const n = Number(s);
	return Number.isFinite(n) ? n : null;
}

type Row = { line: number; cells: string[] };
type Month = { month: number; temperature: number; relativeHumidity: number };
type Field = keyof typeof COLUMN_NAMES;
/** Where each field's column is in the header (0-based). */
type Columns = Record<Field, number>;
/** One cell read: its value, or why it cannot be used (without the line and column). */
type Reading = { ok: true; value: number } | { ok: false; message: string };

const EMPTY_FILE = 'The file is empty; it needs a header row and 12 rows, one per month.';
const ALL_MONTHS = Array.from({ length: 12 }, (_, i) => i + 1);

const refusal = (problem: CsvProblem): ClimateCsvResult => ({ ok: false, problems: [problem] });
const plural = (n: number, word: string) => `${n} ${word}${n === 1 ? '' : 's'}`;

/** The twelve months of a climate CSV upload (see the top of this file), or every problem found. */
export function parseClimateCsv(input: string | Uint8Array): ClimateCsvResult {
	const text = textOf(input);
	if (typeof text !== 'string') return text;
	if (text.trim() === '') return refusal({ message: EMPTY_FILE });

	const { rows, delimiter } = splitRows(text);
	const nonEmpty = rows.filter((r) => r.cells.some((c) => c.trim() !== ''));
	if (nonEmpty.length === 0) return refusal({ message: EMPTY_FILE });
	const decimalComma = delimiter !== ',';

	const [header, ...body] = nonEmpty;
	const columns = columnsOf(header, decimalComma);
	if ('message' in columns) return refusal(columns);
	if (body.length === 0) {
		return refusal({ message: 'The file has a header but no months; 12 rows are needed, one per month.' });
	}

	const { months, firstLine, problems } = readMonths(body, columns, header.cells.length, decimalComma);
	const count = monthCountProblem(body.length, firstLine, problems.length);
	if (count) problems.push(count);

	if (problems.length > 0) return { ok: false, problems };
	months.sort((a, b) => a.month - b.month);
	return { ok: true, months, delimiter };
}

/**
 * The upload as text, without a byte order mark; or its refusal: too large, or not readable text (the
 * same refusals, with the same messages, as every other upload: workbooks, binary data, UTF-16, and
 * text that is not UTF-8, with the line of the first bad byte).
 */
function textOf(input: string | Uint8Array): string | ClimateCsvResult {
	let text: string;
	if (typeof input === 'string') {
		text = input;
	} else {
		if (input.byteLength > CLIMATE_CSV_MAX_BYTES) return tooLarge(input.byteLength);
		if (input.byteLength > 0) {
			try {
				text = decodeUpload(input, CLIMATE_CSV_MAX_BYTES).text;
			} catch (e) {
				if (e instanceof CsvFileError) return refusal({ line: e.line, message: e.message });
				throw e;
			}
		} else text = '';
	}
	if (text.length > CLIMATE_CSV_MAX_BYTES) return tooLarge(text.length);
	return text.replace(/^\uFEFF/, '');
}

/** The records, each with the line it starts on (a quoted field may span lines), and the delimiter. */
function splitRows(text: string): { rows: Row[]; delimiter: string } {
	const rows: Row[] = [];
	let line = 1;
	let consumed = 0;
	let delimiter = ',';
	Papa.parse<string[]>(text, {
		header: false,
		skipEmptyLines: false,
		delimitersToGuess: [',', ';', '\t'],
		step: (res) => {
			delimiter = res.meta.delimiter;
			const end = res.meta.cursor;
			const chunk = text.slice(consumed, end);
			rows.push({ line, cells: res.data });
			for (const ch of chunk) if (ch === '\n') line++;
			consumed = end;
		}
	});
	return { rows, delimiter };
}

/** The column of each field, found by its header names; or the problem with the header row. */
function columnsOf(header: Row, decimalComma: boolean): Columns | CsvProblem {
	const headers = header.cells.map(normaliseHeader);
	const index: Partial<Columns> = {};
	for (const [field, names] of Object.entries(COLUMN_NAMES) as [Field, string[]][]) {
		const i = headers.findIndex((h) => names.includes(h));
		if (i >= 0) index[field] = i;
	}
	const missing = (Object.keys(COLUMN_NAMES) as Field[]).filter((f) => index[f] === undefined);
	if (missing.length > 0) return { line: header.line, message: headerMessage(header, missing, decimalComma) };
	return index as Columns;
}

/** Why the header row does not do: it looks like data, or it lacks the named columns. */
function headerMessage(header: Row, missing: Field[], decimalComma: boolean): string {
	const looksNumeric = header.cells.every(
		(c) => parseNumber(c, decimalComma) !== null || MONTH_WORDS.has(c.trim().toLowerCase())
	);
	if (looksNumeric) {
		return `line ${header.line}: the first row must be a header naming the columns month, temperature and relative_humidity`;
	}
	const named = missing.map((m) => `'${m}'`).join(' or ');
	const found = header.cells.map((c) => `'${c.trim()}'`).join(', ');
	return `line ${header.line}: no ${named} column; the header must name month, temperature and relative_humidity (found ${found})`;
}

/**
 * Every row below the header, in file order: the months read, the line each month was first given on,
 * and the problems, row by row (a short row; then month, temperature and relative humidity; then a
 * month given twice).
 */
function readMonths(
	body: Row[],
	columns: Columns,
	headerCount: number,
	decimalComma: boolean
): { months: Month[]; firstLine: Map<number, number>; problems: CsvProblem[] } {
	const months: Month[] = [];
	const firstLine = new Map<number, number>();
	const problems: CsvProblem[] = [];
	for (const row of body) {
		if (row.cells.length < headerCount) {
			problems.push({
				line: row.line,
				message: `line ${row.line}: ${plural(row.cells.length, 'value')}, ${headerCount} expected`
			});
			continue;
		}
		const found = readMonthRow(row, columns, decimalComma, firstLine);
		problems.push(...found.problems);
		if (found.month) months.push(found.month);
	}
	return { months, firstLine, problems };
}

/**
 * One row of a month: its values when all three are good and the month is not given twice, and the
 * problems of its cells. A month read for the first time is noted in `firstLine`, even when another
 * cell of the row is at fault.
 */
function readMonthRow(
	row: Row,
	columns: Columns,
	decimalComma: boolean,
	firstLine: Map<number, number>
): { month: Month | null; problems: CsvProblem[] } {
	const problems: CsvProblem[] = [];
	const at = (f: Field) => (row.cells[columns[f]] ?? '').trim();
	const check = (field: Field, r: Reading): number | null => {
		if (r.ok) return r.value;
		problems.push({ line: row.line, field, message: `line ${row.line}, ${field}: ${r.message}` });
		return null;
	};
	const month = check('month', readMonth(at('month'), decimalComma));
	const temperature = check('temperature', readTemperature(at('temperature'), decimalComma));
	const relativeHumidity = check(
		'relative_humidity',
		readRelativeHumidity(at('relative_humidity'), decimalComma)
	);
	if (month !== null) {
		const first = firstLine.get(month);
		if (first !== undefined) {
			check('month', { ok: false, message: `month ${month} appears twice (first on line ${first})` });
			return { month: null, problems };
		}
		firstLine.set(month, row.line);
	}
	if (problems.length > 0 || month === null || temperature === null || relativeHumidity === null) {
		return { month: null, problems };
	}
	return { month: { month, temperature, relativeHumidity }, problems };
}

/** A month: 1–12, or its name in English, written out or in three letters, in any case. */
function readMonth(raw: string, decimalComma: boolean): Reading {
	if (raw === '') return { ok: false, message: 'is empty' };
	const month = MONTH_WORDS.get(raw.toLowerCase()) ?? parseNumber(raw, decimalComma);
	if (month === null || !Number.isInteger(month) || month < 1 || month > 12) {
		return { ok: false, message: `${show(raw)} is not a month (use 1–12 or the month's name)` };
	}
	return { ok: true, value: month };
}

/** A monthly mean external temperature in °C, within −80 to 80 °C. */
function readTemperature(raw: string, decimalComma: boolean): Reading {
	const t = readNumber(raw, decimalComma);
	if (!t.ok) return t;
	if (t.value < -80 || t.value > 80) return { ok: false, message: `${raw} °C is outside −80 to 80 °C` };
	return t;
}

/** A relative humidity in % (0–100); a value above 0 and up to 1 looks like a fraction and is refused. */
function readRelativeHumidity(raw: string, decimalComma: boolean): Reading {
	const rh = readNumber(raw, decimalComma);
	if (!rh.ok) return rh;
	if (rh.value < 0 || rh.value > 100) return { ok: false, message: `${raw} is outside 0–100 %` };
	if (rh.value > 0 && rh.value <= 1) {
		return { ok: false, message: `${raw} looks like a fraction; give relative humidity in % (0–100)` };
	}
	return rh;
}

/** A cell that must hold a number: empty, not a number, or its value. */
function readNumber(raw: string, decimalComma: boolean): Reading {
	if (raw === '') return { ok: false, message: 'is empty' };
	const n = parseNumber(raw, decimalComma);
	return n === null ? { ok: false, message: `${show(raw)} is not a number` } : { ok: true, value: n };
}

/**
 * The problem with the number of months, if any: not twelve rows (naming the months absent when there
 * are fewer), or twelve rows without all twelve months when nothing else is wrong.
 */
function monthCountProblem(
	rows: number,
	firstLine: Map<number, number>,
	problemsSoFar: number
): CsvProblem | null {
	const absent = () =>
		ALL_MONTHS.filter((m) => !firstLine.has(m))
			.map((m) => MONTH_NAMES[m - 1])
			.join(', ');
	if (rows !== 12) {
		const missing = rows < 12 && ALL_MONTHS.some((m) => !firstLine.has(m)) ? ` (missing: ${absent()})` : '';
		return { message: `${plural(rows, 'month')} given, 12 needed${missing}` };
	}
	if (problemsSoFar === 0 && firstLine.size !== 12) return { message: `months missing: ${absent()}` };
	return null;
}

function tooLarge(size: number): ClimateCsvResult {
	return refusal({
		message: `The file is ${Math.ceil(size / 1024)} KB; a climate file has 13 lines and must be under ${CLIMATE_CSV_MAX_BYTES / 1024} KB.`
	});
}
