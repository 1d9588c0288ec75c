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

export function parseClimateCsv(input: string | Uint8Array): ClimateCsvResult {
	const problems: CsvProblem[] = [];
	let text: string;
	if (typeof input === 'string') {
		text = input;
	} else {
		if (input.byteLength > CLIMATE_CSV_MAX_BYTES) {
			return tooLarge(input.byteLength);
		}
		if (input.byteLength > 0) {
			// The same refusals, with the same messages, as every other upload: workbooks, binary data,
			// UTF-16, and text that is not UTF-8 (with the line of the first bad byte).
			try {
				text = decodeUpload(input, CLIMATE_CSV_MAX_BYTES).text;
			} catch (e) {
				if (e instanceof CsvFileError) return { ok: false, problems: [{ line: e.line, message: e.message }] };
				throw e;
			}
		} else text = '';
	}
	if (text.length > CLIMATE_CSV_MAX_BYTES) return tooLarge(text.length);
	text = text.replace(/^\uFEFF/, '');
	if (text.trim() === '') {
		return {
			ok: false,
			problems: [{ message: 'The file is empty; it needs a header row and 12 rows, one per month.' }]
		};
	}

	// Rows with the line each starts on (a quoted field may span lines).
	const rows: { line: number; cells: string[] }[] = [];
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
	const nonEmpty = rows.filter((r) => r.cells.some((c) => c.trim() !== ''));
	if (nonEmpty.length === 0) {
		return {
			ok: false,
			problems: [{ message: 'The file is empty; it needs a header row and 12 rows, one per month.' }]
		};
	}
	const decimalComma = delimiter !== ',';

	const [header, ...body] = nonEmpty;
	const headers = header.cells.map(normaliseHeader);
	const index: Record<string, number> = {};
	for (const [field, names] of Object.entries(COLUMN_NAMES)) {
		const i = headers.findIndex((h) => names.includes(h));
		if (i >= 0) index[field] = i;
	}
	const missing = Object.keys(COLUMN_NAMES).filter((f) => index[f] === undefined);
	if (missing.length > 0) {
		const looksNumeric = header.cells.every(
			(c) => parseNumber(c, decimalComma) !== null || MONTH_WORDS.has(c.trim().toLowerCase())
		);
		return {
			ok: false,
			problems: [
				{
					line: header.line,
					message: looksNumeric
						? `line ${header.line}: the first row must be a header naming the columns month, temperature and relative_humidity`
						: `line ${header.line}: no ${missing.map((m) => `'${m}'`).join(' or ')} column; the header must name month, temperature and relative_humidity (found ${header.cells.map((c) => `'${c.trim()}'`).join(', ')})`
				}
			]
		};
	}
	if (body.length === 0) {
		return {
			ok: false,
			problems: [{ message: 'The file has a header but no months; 12 rows are needed, one per month.' }]
		};
	}

	const months: { month: number; temperature: number; relativeHumidity: number }[] = [];
	const firstLine = new Map<number, number>();
	for (const row of body) {
		const at = (f: string) => (row.cells[index[f]] ?? '').trim();
		if (row.cells.length < headers.length) {
			problems.push({
				line: row.line,
				message: `line ${row.line}: ${row.cells.length} value${row.cells.length === 1 ? '' : 's'}, ${headers.length} expected`
			});
			continue;
		}
		let ok = true;
		const bad = (field: string, message: string) => {
			ok = false;
			problems.push({ line: row.line, field, message: `line ${row.line}, ${field}: ${message}` });
		};

		const rawMonth = at('month');
		let month: number | null = MONTH_WORDS.get(rawMonth.toLowerCase()) ?? parseNumber(rawMonth, decimalComma);
		if (rawMonth === '') bad('month', 'is empty');
		else if (month === null || !Number.isInteger(month) || month < 1 || month > 12) {
			bad('month', `${show(rawMonth)} is not a month (use 1–12 or the month's name)`);
			month = null;
		}

		const rawT = at('temperature');
		const temperature = parseNumber(rawT, decimalComma);
		if (rawT === '') bad('temperature', 'is empty');
		else if (temperature === null) bad('temperature', `${show(rawT)} is not a number`);
		else if (temperature < -80 || temperature > 80) bad('temperature', `${rawT} °C is outside −80 to 80 °C`);

		const rawRh = at('relative_humidity');
		const rh = parseNumber(rawRh, decimalComma);
		if (rawRh === '') bad('relative_humidity', 'is empty');
		else if (rh === null) bad('relative_humidity', `${show(rawRh)} is not a number`);
		else if (rh < 0 || rh > 100) bad('relative_humidity', `${rawRh} is outside 0–100 %`);
		else if (rh > 0 && rh <= 1) {
			bad('relative_humidity', `${rawRh} looks like a fraction; give relative humidity in % (0–100)`);
		}

		if (month !== null) {
			const first = firstLine.get(month);
			if (first !== undefined) {
				bad('month', `month ${month} appears twice (first on line ${first})`);
				continue;
			}
			firstLine.set(month, row.line);
		}
		if (ok && month !== null && temperature !== null && rh !== null) {
			months.push({ month, temperature, relativeHumidity: rh });
		}
	}

	if (body.length !== 12) {
		const absent = Array.from({ length: 12 }, (_, i) => i + 1).filter((m) => !firstLine.has(m));
		problems.push({
			message:
				`${body.length} month${body.length === 1 ? '' : 's'} given, 12 needed` +
				(body.length < 12 && absent.length > 0
					? ` (missing: ${absent.map((m) => MONTH_NAMES[m - 1]).join(', ')})`
					: '')
		});
	} else if (problems.length === 0 && firstLine.size !== 12) {
		const absent = Array.from({ length: 12 }, (_, i) => i + 1).filter((m) => !firstLine.has(m));
		problems.push({ message: `months missing: ${absent.map((m) => MONTH_NAMES[m - 1]).join(', ')}` });
	}

	if (problems.length > 0) return { ok: false, problems };
	months.sort((a, b) => a.month - b.month);
	return { ok: true, months, delimiter };
}

function tooLarge(size: number): ClimateCsvResult {
	return {
		ok: false,
		problems: [
			{
				message: `The file is ${Math.ceil(size / 1024)} KB; a climate file has 13 lines and must be under ${CLIMATE_CSV_MAX_BYTES / 1024} KB.`
			}
		]
	};
}
