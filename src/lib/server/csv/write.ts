/**
 * Writing CSV that opens safely in a spreadsheet: RFC 4180 quoting, CRLF line ends, a UTF-8 BOM so
 * spreadsheet programs pick the right encoding, and text cells that begin with =, +, -, @, tab or CR
 * prefixed with an apostrophe so they are shown, not run ("CSV injection", OWASP; common practice).
 */
import Papa from 'papaparse';
import { FORMULA_START } from '$lib/library/schema';

export type Cell = string | number | boolean | null | undefined;

/** Neutralise one text cell; numbers are written as they are (a negative number is not a formula). */
export function neutralise(cell: Cell): string {
	if (cell === null || cell === undefined) return '';
	if (typeof cell === 'number') return Number.isFinite(cell) ? String(cell) : '';
	if (typeof cell === 'boolean') return cell ? 'yes' : 'no';
	return FORMULA_START.test(cell) ? `'${cell}` : cell;
}

/** Undo `neutralise` on import: an apostrophe before a formula character is dropped. */
export function unneutralise(cell: string): string {
	return cell.length > 1 && cell[0] === "'" && FORMULA_START.test(cell.slice(1)) ? cell.slice(1) : cell;
}

/** A whole CSV document from a header and rows. */
export function toCsv(
	headers: string[],
	rows: Iterable<Cell[]>,
	opts: { delimiter?: ',' | ';'; bom?: boolean } = {}
): string {
	const data: string[][] = [headers.map(neutralise)];
	for (const r of rows) data.push(r.map(neutralise));
	const body = Papa.unparse(data, {
		delimiter: opts.delimiter ?? ',',
		newline: '\r\n',
		quotes: false,
		escapeFormulae: false
	});
	return (opts.bom === false ? '' : '\uFEFF') + body + '\r\n';
}
