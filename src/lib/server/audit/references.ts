/**
 * A CSV (or plain list) of dwelling references for a new batch. One reference per line, or a column
 * headed "reference" in a wider file. Problems come back with their line numbers; nothing is guessed.
 */
import Papa from 'papaparse';
import { decodeUpload, CsvFileError } from '$lib/server/csv/read';

export type ReferenceLine = { line: number; reference: string };
export type ReferenceIssue = { path: string; line?: number; message: string };

const HEADER = /^(dwelling[ _-]?)?ref(erence)?\.?$/i;
const MAX_BYTES = 2 * 1024 * 1024;

export function parseReferenceText(text: string): { lines: ReferenceLine[]; issues: ReferenceIssue[] } {
	const issues: ReferenceIssue[] = [];
	const clean = text.replace(/^\uFEFF/, '');
	const firstLine = clean.split(/\r?\n/, 1)[0] ?? '';
	const counts = [',', ';', '\t']
		.map((d) => [d, firstLine.split(d).length - 1] as const)
		.sort((x, y) => y[1] - x[1]);
	const delimiter = counts[0][1] > 0 ? counts[0][0] : ',';
	const parsed = Papa.parse<string[]>(clean, { skipEmptyLines: false, delimiter });
	for (const e of parsed.errors) {
		if (e.type === 'Quotes')
			issues.push({
				path: 'references',
				line: (e.row ?? 0) + 1,
				message: `line ${(e.row ?? 0) + 1}: a quoted field is never closed`
			});
	}
	const rows = parsed.data;
	let column = 0;
	let start = 0;
	const first = (rows[0] ?? []).map((c) => c.trim());
	const headerAt = first.findIndex((c) => HEADER.test(c));
	if (headerAt >= 0) {
		column = headerAt;
		start = 1;
	} else if (first.length > 1) {
		issues.push({
			path: 'references',
			line: 1,
			message: 'line 1: a file with several columns needs one headed "reference"'
		});
		return { lines: [], issues };
	}
	const lines: ReferenceLine[] = [];
	for (let i = start; i < rows.length; i++) {
		const cells = rows[i];
		if (cells.length === 1 && cells[0].trim() === '') continue;
		const value = (cells[column] ?? '').trim();
		if (value === '') {
			issues.push({ path: 'references', line: i + 1, message: `line ${i + 1}: the reference is empty` });
			continue;
		}
		if (value.length > 200) {
			issues.push({
				path: 'references',
				line: i + 1,
				message: `line ${i + 1}: the reference is longer than 200 characters`
			});
			continue;
		}
		lines.push({ line: i + 1, reference: value });
	}
	if (lines.length === 0 && issues.length === 0)
		issues.push({ path: 'references', message: 'the list has no references' });
	return { lines, issues };
}

/** An uploaded file: checked for size, binary content and encoding first. */
export function parseReferenceFile(bytes: Uint8Array): { lines: ReferenceLine[]; issues: ReferenceIssue[] } {
	try {
		const { text } = decodeUpload(bytes, MAX_BYTES);
		return parseReferenceText(text);
	} catch (e) {
		if (e instanceof CsvFileError)
			return { lines: [], issues: [{ path: 'file', line: e.line, message: e.message }] };
		throw e;
	}
}
