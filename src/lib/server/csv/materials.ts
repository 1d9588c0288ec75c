/**
 * The material library's CSV import and export. The import reads the file row by row (csv/read.ts),
 * maps columns by header (or by a mapping the user gave, remembered per header line), validates each
 * row with the library schema, compares it with the current revision of the same code and returns a
 * preview. Committing re-reads the same file and writes every accepted row in one transaction.
 */
import { createHash } from 'node:crypto';
import Papa from 'papaparse';
import type { Db } from '../db';
import {
	CsvFileError,
	decodeUpload,
	detectDelimiter,
	parseCsv,
	parseNumber,
	DEFAULT_MAX_BYTES,
	type CsvInfo,
	type Delimiter
} from './read';
import { toCsv, unneutralise, type Cell } from './write';
import {
	diffValues,
	FIELD_LABELS,
	LAMBDA_KIND_LABELS,
	LAMBDA_KINDS,
	MATERIAL_CATEGORIES,
	MATERIAL_CATEGORY_LABELS,
	materialValuesSchema,
	REVISION_FIELDS,
	type FieldChange,
	type MaterialValues
} from '../../library/schema';
import { plausibilityWarnings } from '../../library/ranges';
import { currentByCodes, insertNewMaterials, insertNewRevisions, type Actor } from '../materials';

export { CsvFileError };

export const IMPORT_FIELDS = ['code', ...REVISION_FIELDS] as const;
export type ImportField = (typeof IMPORT_FIELDS)[number];

/** The column names the export writes and the import reads first. */
export const CSV_COLUMNS: Record<ImportField, string> = {
	code: 'code',
	name: 'name',
	manufacturer: 'manufacturer',
	category: 'category',
	lambda: 'lambda',
	lambdaKind: 'lambda_kind',
	resistance: 'resistance',
	muDry: 'mu_dry',
	muWet: 'mu_wet',
	sd: 'sd',
	density: 'density',
	specificHeat: 'specific_heat',
	thicknessMinMm: 'thickness_min_mm',
	thicknessMaxMm: 'thickness_max_mm',
	source: 'source',
	sourceIssued: 'source_issued',
	sourceExpires: 'source_expires',
	indicative: 'indicative',
	notes: 'notes'
};

const NUMERIC = new Set<ImportField>([
	'lambda',
	'resistance',
	'muDry',
	'muWet',
	'sd',
	'density',
	'specificHeat',
	'thicknessMinMm',
	'thicknessMaxMm'
]);
const REQUIRED: ImportField[] = ['code', 'name', 'category'];

/** A header as a key: lower case, units in brackets dropped, runs of other characters as one '_'. */
export function normaliseHeader(h: string): string {
	return h
		.toLowerCase()
		.replace(/\(.*?\)|\[.*?\]/g, ' ')
		.replace(/[^a-z0-9λμρ]+/g, '_')
		.replace(/^_+|_+$/g, '');
}

const ALIASES: Record<string, ImportField> = {};
const alias = (field: ImportField, ...names: string[]) => {
	for (const n of names) ALIASES[normaliseHeader(n)] = field;
};
for (const f of IMPORT_FIELDS) alias(f, CSV_COLUMNS[f], f, FIELD_LABELS[f]);
alias('code', 'material code', 'material_code', 'id', 'ref', 'reference', 'product code');
alias('name', 'material', 'material name', 'description', 'product', 'product name');
alias('manufacturer', 'maker', 'producer', 'brand', 'supplier');
alias('category', 'group', 'material group', 'type');
alias('lambda', 'λ', 'conductivity', 'thermal conductivity', 'lambda w/mk', 'lambda_w_mk');
alias('lambdaKind', 'λ kind', 'lambda type', 'kind of lambda', 'value kind');
alias('resistance', 'r', 'r value', 'r-value', 'thermal resistance');
alias('muDry', 'μ dry', 'mu', 'μ', 'vapour resistance factor', 'mu dry cup', 'μ dry cup');
alias('muWet', 'μ wet', 'mu wet cup', 'μ wet cup');
alias('sd', 'sd value', 'sd-value', 's_d');
alias('density', 'rho', 'ρ');
alias('specificHeat', 'cp', 'c', 'specific heat capacity', 'heat capacity');
alias('thicknessMinMm', 'thickness min', 'min thickness', 'thickness from', 'thickness min mm');
alias('thicknessMaxMm', 'thickness max', 'max thickness', 'thickness to', 'thickness max mm');
alias('source', 'source document', 'reference document');
alias('sourceIssued', 'issued', 'issue date', 'date issued', 'source issue date');
alias('sourceExpires', 'expires', 'expiry', 'expiry date', 'valid until', 'source expiry date');
alias('notes', 'note', 'comments', 'comment', 'remarks');

/** fileHeader → field, or null to ignore that column. */
export type ColumnMapping = Record<string, ImportField | null>;

export function headerSignature(headers: string[]): string {
	return headers.map(normaliseHeader).join('|');
}

/** The mapping of recognised headers, and which headers were not recognised. */
export function recogniseHeaders(headers: string[]): { mapping: ColumnMapping; unknown: string[] } {
	const mapping: ColumnMapping = {};
	const unknown: string[] = [];
	const used = new Set<ImportField>();
	for (const h of headers) {
		const f = ALIASES[normaliseHeader(h)];
		if (f && !used.has(f)) {
			mapping[h] = f;
			used.add(f);
		} else {
			mapping[h] = null;
			if (h.trim() !== '') unknown.push(h);
		}
	}
	return { mapping, unknown };
}

/** Problems with a mapping: a field mapped twice, a required field not mapped. */
export function mappingProblems(headers: string[], mapping: ColumnMapping): string[] {
	const problems: string[] = [];
	const seen = new Map<ImportField, string>();
	for (const h of headers) {
		const f = mapping[h];
		if (f === undefined || f === null) continue;
		if (!(IMPORT_FIELDS as readonly string[]).includes(f)) {
			problems.push(`column '${h}' is mapped to '${f}', which is not a library field`);
			continue;
		}
		if (seen.has(f))
			problems.push(`'${CSV_COLUMNS[f]}' is given by two columns: '${seen.get(f)}' and '${h}'`);
		seen.set(f, h);
	}
	const missing = REQUIRED.filter((f) => !seen.has(f)).map((f) => CSV_COLUMNS[f]);
	if (!seen.has('lambda') && !seen.has('resistance')) missing.push('lambda or resistance');
	if (missing.length)
		problems.push(`required ${missing.length === 1 ? 'column' : 'columns'} missing: ${missing.join(', ')}`);
	return problems;
}

/** A problem with one row: `column` names the CSV column at fault, or is '' when the whole row is. */
export type RowIssue = { column: string; message: string };
export type RowStatus = 'new' | 'changed' | 'unchanged' | 'rejected';
export type PreviewRow = {
	line: number;
	code: string;
	name: string;
	category: string;
	status: RowStatus;
	errors: RowIssue[];
	warnings: RowIssue[];
	changes: FieldChange[];
};
export type ImportCounts = {
	new: number;
	changed: number;
	unchanged: number;
	rejected: number;
	warnings: number;
};

export type ImportPreview = {
	kind: 'preview';
	file: CsvInfo;
	mapping: ColumnMapping;
	mappingSource: 'recognised' | 'saved' | 'given';
	counts: ImportCounts;
	rows: PreviewRow[];
	/** the same file and library state give the same token; commit refuses a different one */
	token: string;
};

export type MappingNeeded = {
	kind: 'mapping';
	message: string;
	headers: string[];
	suggested: ColumnMapping;
	problems: string[];
	fields: { field: ImportField; column: string; label: string; required: boolean }[];
};

export type ImportSummary = {
	added: number;
	changed: number;
	unchanged: number;
	rejected: number;
	mappingSaved: boolean;
};

const CATEGORY_BY_TEXT = new Map<string, string>();
for (const c of MATERIAL_CATEGORIES) {
	CATEGORY_BY_TEXT.set(c, c);
	CATEGORY_BY_TEXT.set(MATERIAL_CATEGORY_LABELS[c].toLowerCase(), c);
}
const KIND_BY_TEXT = new Map<string, string>();
for (const k of LAMBDA_KINDS) {
	KIND_BY_TEXT.set(k, k);
	KIND_BY_TEXT.set(LAMBDA_KIND_LABELS[k].toLowerCase(), k);
}
const YES = new Set(['yes', 'y', 'true', '1', 'x']);
const NO = new Set(['no', 'n', 'false', '0', '']);

type ParsedRow = {
	line: number;
	code: string;
	values: MaterialValues | null;
	raw: Record<string, unknown>;
	errors: RowIssue[];
	warnings: RowIssue[];
};

/** One record → values and per-column issues. */
function readRow(
	cells: string[],
	line: number,
	headers: string[],
	mapping: ColumnMapping,
	delimiter: Delimiter,
	today: string
): ParsedRow {
	const raw: Record<string, unknown> = {};
	const errors: RowIssue[] = [];
	const failed = new Set<string>();
	const columnOf: Partial<Record<ImportField, string>> = {};
	if (cells.length !== headers.length) {
		// The cells cannot be placed under their columns: say so and nothing else. The code is named when its
		// cell is there to read (the separator fault may lie after it).
		const codeAt = headers.findIndex((h) => mapping[h] === 'code');
		const code = codeAt >= 0 && codeAt < cells.length ? unneutralise((cells[codeAt] ?? '').trim()) : '';
		const message = `${code ? `the row for '${code}'` : 'the row'} has ${cells.length} ${cells.length === 1 ? 'cell' : 'cells'} but the header has ${headers.length} columns; check for a missing or extra separator${cells.length > headers.length ? ' (text with a separator needs "quotes")' : ''}`;
		return {
			line,
			code: '',
			values: null,
			raw: { code },
			errors: [{ column: '', message }],
			warnings: []
		};
	}
	for (let i = 0; i < headers.length; i++) {
		const field = mapping[headers[i]];
		if (!field) continue;
		columnOf[field] = headers[i];
		const cell = unneutralise((cells[i] ?? '').trim());
		if (NUMERIC.has(field)) {
			const n = parseNumber(cell, delimiter);
			if (n.ok) raw[field] = n.value;
			else {
				errors.push({ column: headers[i], message: n.message });
				failed.add(field);
			}
		} else if (field === 'category') {
			raw[field] = cell === '' ? undefined : (CATEGORY_BY_TEXT.get(cell.toLowerCase()) ?? cell);
		} else if (field === 'lambdaKind') {
			raw[field] = cell === '' ? null : (KIND_BY_TEXT.get(cell.toLowerCase()) ?? cell);
		} else if (field === 'indicative') {
			const t = cell.toLowerCase();
			if (YES.has(t)) raw[field] = true;
			else if (NO.has(t)) raw[field] = false;
			else {
				errors.push({ column: headers[i], message: `'${cell}' is not yes or no` });
				failed.add(field);
			}
		} else if (field === 'sourceIssued' || field === 'sourceExpires') {
			const dmy = /^(\d{1,2})\.(\d{1,2})\.(\d{4})$/.exec(cell);
			raw[field] =
				cell === '' ? null : dmy ? `${dmy[3]}-${dmy[2].padStart(2, '0')}-${dmy[1].padStart(2, '0')}` : cell;
		} else if (field === 'code' || field === 'name') {
			raw[field] = cell;
		} else if (field === 'manufacturer') {
			raw[field] = cell === '' ? 'generic' : cell;
		} else {
			raw[field] = cell === '' ? null : cell;
		}
	}
	const colName = (path: string) => columnOf[path as ImportField] ?? CSV_COLUMNS[path as ImportField] ?? path;
	const parsed = materialValuesSchema.safeParse(raw);
	const lambdaOrRFailed = failed.has('lambda') || failed.has('resistance');
	if (!parsed.success) {
		for (const iss of parsed.error.issues) {
			const f = String(iss.path[0] ?? '');
			if (failed.has(f)) continue;
			if (lambdaOrRFailed && (f === 'lambda' || f === 'resistance' || f === 'lambdaKind')) continue;
			if (f === 'muDry' && failed.has('muWet')) continue;
			errors.push({ column: colName(f), message: iss.message });
		}
	}
	const values = parsed.success && errors.length === 0 ? parsed.data : null;
	const warnings = values
		? plausibilityWarnings(values, today).map((w) => ({ column: colName(w.field), message: w.message }))
		: [];
	return { line, code: String(raw.code ?? ''), values, raw, errors, warnings };
}

type Analysis = {
	info: CsvInfo;
	mapping: ColumnMapping;
	mappingSource: ImportPreview['mappingSource'];
	rows: ParsedRow[];
	preview: ImportPreview;
	existing: Awaited<ReturnType<typeof currentByCodes>>;
};

export type ImportOptions = { mapping?: ColumnMapping | null; maxBytes?: number; today?: string };

async function analyse(
	k: Db,
	organisationId: string,
	bytes: Uint8Array,
	opts: ImportOptions
): Promise<Analysis | MappingNeeded> {
	const { text, bom } = decodeUpload(bytes, opts.maxBytes ?? DEFAULT_MAX_BYTES);
	if (text.trim() === '') throw new CsvFileError('The file is empty: it has only blank lines.', 'empty');
	const delimiter = detectDelimiter(text);
	const today = opts.today ?? new Date().toISOString().slice(0, 10);

	// The header decides the mapping before any row is read.
	let headers: string[] = [];
	let mapping: ColumnMapping | null = null;
	let mappingSource: ImportPreview['mappingSource'] = 'recognised';
	let needed: MappingNeeded | null = null;
	const firstLine = text.slice(0, Math.max(0, text.search(/\r?\n/)) || text.length);
	headers = Papa.parse<string[]>(firstLine, { delimiter }).data[0]?.map((h) => h.trim()) ?? [];
	const blank = headers.findIndex((h) => h === '');
	if (headers.length > 0 && blank >= 0 && headers.slice(blank).some((h) => h !== '')) {
		throw new CsvFileError(
			`Line 1, column ${blank + 1} has no name; give every column a name in the header line.`,
			'header',
			1
		);
	}
	if (opts.mapping) {
		mapping = opts.mapping;
		mappingSource = 'given';
	} else {
		const saved = await k('import_mappings')
			.where({
				organisation_id: organisationId,
				kind: 'materials',
				header_signature: headerSignature(headers)
			})
			.first('mapping');
		if (saved) {
			mapping = saved.mapping as ColumnMapping;
			mappingSource = 'saved';
		} else {
			const rec = recogniseHeaders(headers);
			const problems = mappingProblems(headers, rec.mapping);
			if (rec.unknown.length === 0 && problems.length > 0) {
				throw new CsvFileError(
					`Line 1: ${problems.join('; ')}. The header has: ${headers.join(', ')}.`,
					'header',
					1
				);
			}
			if (rec.unknown.length > 0) {
				needed = {
					kind: 'mapping',
					message: `Envelo does not know ${rec.unknown.length === 1 ? 'the column' : 'these columns'}: ${rec.unknown.map((u) => `'${u}'`).join(', ')}. Say which library field each column holds (or ignore it); the choice is remembered for files with the same header.`,
					headers,
					suggested: rec.mapping,
					problems,
					fields: IMPORT_FIELDS.map((f) => ({
						field: f,
						column: CSV_COLUMNS[f],
						label: FIELD_LABELS[f],
						required: REQUIRED.includes(f)
					}))
				};
			}
			mapping = rec.mapping;
		}
	}
	if (!needed) {
		const problems = mappingProblems(headers, mapping!);
		if (problems.length) {
			if (mappingSource === 'recognised')
				throw new CsvFileError(`Line 1: ${problems.join('; ')}.`, 'header', 1);
			needed = {
				kind: 'mapping',
				message: `The column mapping is not complete: ${problems.join('; ')}.`,
				headers,
				suggested: mapping!,
				problems,
				fields: IMPORT_FIELDS.map((f) => ({
					field: f,
					column: CSV_COLUMNS[f],
					label: FIELD_LABELS[f],
					required: REQUIRED.includes(f)
				}))
			};
		}
	}

	// Rows are read even when a mapping is needed, so a broken file says so at once.
	const rows: ParsedRow[] = [];
	let decimal: '.' | ',' = '.';
	const m = mapping!;
	const info0 = parseCsv(
		text,
		delimiter,
		() => {},
		(cells, line) => {
			if (needed) return;
			const r = readRow(cells, line, headers, m, delimiter, today);
			if (delimiter === ';' && decimal === '.' && cells.some((c) => /^\s*[+-]?\d*,\d+\s*$/.test(c)))
				decimal = ',';
			rows.push(r);
		}
	);
	if (needed) return needed;
	const info: CsvInfo = { bytes: bytes.length, bom, delimiter, decimal, headers, rows: info0.rows };

	// Duplicate codes within the file: all occurrences are rejected, since we cannot know which is right.
	const linesByCode = new Map<string, number[]>();
	for (const r of rows) if (r.code) linesByCode.set(r.code, [...(linesByCode.get(r.code) ?? []), r.line]);
	const codeColumn = headers.find((h) => m[h] === 'code') ?? 'code';
	for (const r of rows) {
		const lines = linesByCode.get(r.code);
		if (r.code && lines && lines.length > 1) {
			r.errors.push({
				column: codeColumn,
				message: `code '${r.code}' appears on lines ${lines.join(', ')}; keep one of them`
			});
			r.values = null;
			r.warnings = [];
		}
	}

	const codes = rows.filter((r) => r.values).map((r) => r.code);
	const existing = await currentByCodes(k, organisationId, codes);
	const counts: ImportCounts = { new: 0, changed: 0, unchanged: 0, rejected: 0, warnings: 0 };
	const preview: PreviewRow[] = rows.map((r) => {
		const base = {
			line: r.line,
			// a row whose cells cannot be placed still shows the code it seems to carry
			code: r.code || String(r.raw.code ?? ''),
			name: String(r.raw.name ?? ''),
			category: String(r.raw.category ?? ''),
			errors: r.errors,
			warnings: r.warnings
		};
		if (!r.values) {
			counts.rejected++;
			return { ...base, status: 'rejected', warnings: [], changes: [] };
		}
		const cur = existing.get(r.code);
		if (!cur) {
			counts.new++;
			if (r.warnings.length) counts.warnings++;
			return { ...base, status: 'new', changes: [] };
		}
		const changes = diffValues(cur.values, r.values);
		if (changes.length === 0) {
			counts.unchanged++;
			return { ...base, status: 'unchanged', warnings: [], changes };
		}
		counts.changed++;
		if (r.warnings.length) counts.warnings++;
		return { ...base, status: 'changed', changes };
	});

	const hash = createHash('sha256')
		.update(bytes)
		.update(JSON.stringify(headers.map((h) => [h, m[h] ?? null])));
	for (const code of [...existing.keys()].sort()) hash.update(`${code}=${existing.get(code)!.revisionId};`);
	return {
		info,
		mapping: m,
		mappingSource,
		rows,
		existing,
		preview: {
			kind: 'preview',
			file: info,
			mapping: m,
			mappingSource,
			counts,
			rows: preview,
			token: hash.digest('hex')
		}
	};
}

/** Dry run: the preview of every row (nothing is written), or the mapping step when headers are unknown. */
export async function previewMaterialsImport(
	k: Db,
	organisationId: string,
	bytes: Uint8Array,
	opts: ImportOptions = {}
): Promise<ImportPreview | MappingNeeded> {
	const a = await analyse(k, organisationId, bytes, opts);
	return 'kind' in a ? a : a.preview;
}

export class ImportRefused extends Error {
	constructor(
		message: string,
		readonly status: 400 | 409 | 422
	) {
		super(message);
		this.name = 'ImportRefused';
	}
}

/**
 * Commit: re-read the same file, check it gives the preview the user saw (token), and write every
 * accepted row — new materials and new revisions — in one transaction; rejected rows are left out.
 * A mapping the user gave is remembered for the next file with the same header.
 */
export async function commitMaterialsImport(
	k: Db,
	actor: Actor,
	bytes: Uint8Array,
	opts: ImportOptions & { token: string; confirmWarnings?: boolean; fileName?: string },
	log?: (
		entry: {
			organisationId: string;
			userId: string;
			action: string;
			entity: string;
			entityId: string | null;
			details: Record<string, unknown>;
		},
		trx: Db
	) => Promise<void>
): Promise<ImportSummary> {
	return k.transaction(async (trx) => {
		// One import at a time per organisation, so two commits cannot both add the same code.
		await trx.raw('SELECT pg_advisory_xact_lock(hashtext(?))', [`materials-import:${actor.organisationId}`]);
		const a = await analyse(trx, actor.organisationId, bytes, opts);
		if ('kind' in a) throw new ImportRefused(a.message, 400);
		if (a.preview.token !== opts.token) {
			throw new ImportRefused(
				'The file or the library changed since the preview; preview the file again before you confirm.',
				409
			);
		}
		const { counts } = a.preview;
		if (counts.warnings > 0 && !opts.confirmWarnings) {
			throw new ImportRefused(
				`${counts.warnings} ${counts.warnings === 1 ? 'row has' : 'rows have'} warnings; confirm them to import.`,
				422
			);
		}
		const added: MaterialValues[] = [];
		const revised: {
			materialId: string;
			previousRevisionId: string;
			revision: number;
			values: MaterialValues;
		}[] = [];
		a.rows.forEach((r, i) => {
			const status = a.preview.rows[i].status;
			if (status === 'new') added.push(r.values!);
			else if (status === 'changed') {
				const cur = a.existing.get(r.code)!;
				revised.push({
					materialId: cur.materialId,
					previousRevisionId: cur.revisionId,
					revision: cur.revision,
					values: r.values!
				});
			}
		});
		await insertNewMaterials(trx, actor, added);
		await insertNewRevisions(trx, actor, revised);
		let mappingSaved = false;
		if (a.mappingSource === 'given' && (added.length > 0 || revised.length > 0 || counts.unchanged > 0)) {
			await trx('import_mappings')
				.insert({
					organisation_id: actor.organisationId,
					kind: 'materials',
					header_signature: headerSignature(a.info.headers),
					mapping: JSON.stringify(a.mapping)
				})
				.onConflict(['organisation_id', 'kind', 'header_signature'])
				.merge({ mapping: JSON.stringify(a.mapping), updated_at: trx.fn.now() });
			mappingSaved = true;
		}
		const summary: ImportSummary = {
			added: added.length,
			changed: revised.length,
			unchanged: counts.unchanged,
			rejected: counts.rejected,
			mappingSaved
		};
		if (log) {
			await log(
				{
					organisationId: actor.organisationId,
					userId: actor.userId,
					action: 'import',
					entity: 'material',
					entityId: null,
					details: { ...summary, file: opts.fileName ?? null, bytes: bytes.length, rows: a.info.rows }
				},
				trx
			);
		}
		return summary;
	});
}

/** Export the current revision of every material, in the columns the import reads. */
export function materialsToCsv(items: MaterialValues[]): string {
	const headers = IMPORT_FIELDS.map((f) => CSV_COLUMNS[f]);
	function* rows(): Generator<Cell[]> {
		for (const v of items)
			yield IMPORT_FIELDS.map((f) =>
				f === 'indicative' ? (v.indicative ? 'yes' : 'no') : ((v as Record<string, unknown>)[f] as Cell)
			);
	}
	return toCsv(headers, rows());
}
